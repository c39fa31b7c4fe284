import { Link } from 'react-router-dom';
import { Caution } from '../../../components/ui/Notice';
import { digitsFor, fixed as f, interval } from '../../../lib/format';
import type { PooledCell } from '../../../../shared/schemas/synthesis';


/** The current pooled estimate of one cell, with its cautions and a link to open it as a synthesis (`openHref`). */
export function PooledCellSummary({ cell, heading, openHref }: { cell: PooledCell; heading: string; openHref: string }) {
  const d = digitsFor(cell.metric);
  const p = cell.pooled;
  const lvl = `${Math.round(p.level * 100)}%`;
  return (
    <div className="rounded border-l-4 border-caution bg-caution-light/60 p-3">
      <h3 className="mb-1 text-base font-bold">{heading}</h3>
      <p className="text-sm text-ink-soft">
        {cell.metricLabel} · DerSimonian–Laird, effects within a study combined with r = 0.50 · {cell.counts.studies} studies ({cell.counts.effects} effects,{' '}
        {cell.counts.references} {cell.counts.references === 1 ? 'reference' : 'references'})
      </p>
      <p className="my-1 text-xl tabular-nums">
        ◆ <strong>{f(p.estimate, d)}</strong> <span className="text-sm">{lvl} CI {interval(p.ci_lower, p.ci_upper, d)}</span>
      </p>
      <p className="text-sm tabular-nums">
        Prediction interval {interval(p.pi_lower, p.pi_upper, d)} · τ² {f(p.tau2, 4)} · I² {p.I2 == null ? '—' : `${f(p.I2, 1)}%`}
      </p>
      <p className="text-sm text-ink-soft">Sign convention: {cell.signConvention}</p>
      {cell.cautions.map((c) => (
        <Caution key={c.code}>{c.text}</Caution>
      ))}
      <Link to={openHref} className="text-sm">
        Open as a synthesis →
      </Link>
    </div>
  );
}
