export { valueLabel } from '../../../shared/synthesis/labels';
export { modelLabel } from '../../../shared/synthesis/methods';
