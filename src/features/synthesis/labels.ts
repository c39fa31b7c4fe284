export { valueLabel } from '../../../shared/synthesis/labels';
