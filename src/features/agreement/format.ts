import { isPerfectAgreement } from '../../../shared/agreement/reporting';
import { fixed } from '../../lib/format';

/** The κ and SE cells: "perfect agreement" with no SE when κ = 1, else both to 2 dp. */
export function kappaCells(kappa: number | null, se: number | null): { kappa: string; se: string } {
  if (isPerfectAgreement(kappa)) return { kappa: 'perfect agreement', se: '—' };
  return { kappa: fixed(kappa, 2), se: fixed(se, 2) };
}
