import { Link } from 'react-router-dom';
import { digitsFor, fixed as f, interval } from '../../../lib/format';
import { labelOf } from '../../../../shared/vocabulary/labels';
import type { PooledCell } from '../../../../shared/schemas/synthesis';

/** A manipulation's current pooled estimates, compact (each links to `hrefOf(cell)`): each with its k and its outcome kind's sign convention. */
export function EstimateList({ cells, hrefOf }: { cells: PooledCell[]; hrefOf: (c: PooledCell) => string }) {
  if (!cells.length) return <span className="text-ink-faint">no estimate yet</span>;
  return (
    <ul className="m-0 list-none p-0">
      {cells.map((c) => {
        const d = digitsFor(c.metric);
        const p = c.pooled;
        return (
          <li key={`${c.outcome}-${c.parameter}-${c.unit}-${c.metric}`} data-testid="atlas-estimate" className="mb-2">
            <span className="text-sm">
              {labelOf('outcome', c.outcome)} · {c.quantityLabel ? `${c.quantityLabel} · ` : ''}
              {labelOf('metric', c.metric)}
            </span>
            <br />
            <Link to={hrefOf(c)} className="tabular-nums">
              ◆ {f(p.estimate, d)} <span className="text-sm">{Math.round(p.level * 100)}% CI {interval(p.ci_lower, p.ci_upper, d)}</span>
            </Link>{' '}
            <span className="text-sm tabular-nums" data-testid="atlas-k">
              k = {c.counts.studies} {c.counts.studies === 1 ? 'study' : 'studies'} ({c.counts.effects} {c.counts.effects === 1 ? 'effect' : 'effects'})
            </span>
            <br />
            <span className="text-sm text-ink-soft" data-testid="atlas-sign">
              Sign: {c.signConvention}
            </span>
          </li>
        );
      })}
    </ul>
  );
}
