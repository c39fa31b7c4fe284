import type { ComponentType } from 'react';
import type { ComparedResult, SnapshotDiff } from '../../../../shared/schemas/following';
import type { PlotFigure } from '../../../../shared/synthesis/types';
import { EmptyState } from '../../../components/ui/Notice';

type Side = NonNullable<ComparedResult>;
type Changes = Pick<SnapshotDiff, 'then' | 'now' | 'added' | 'withdrawn' | 'corrected' | 'effectsRecorded'>;
type Brief = SnapshotDiff['added'][number];

const f3 = (x: number) => x.toFixed(3);
const ci = (s: Side) => `[${f3(s.ciLower)}, ${f3(s.ciUpper)}]`;

/** The two results side by side: registry version, k, estimate with its CI, tau². */
export function ResultsThenNow({ then, now, thenLabel }: Pick<Changes, 'then' | 'now'> & { thenLabel: string }) {
  const rows: Array<[string, (s: Side) => string]> = [
    ['Registry version', (s) => (s.registryVersion == null ? '—' : String(s.registryVersion))],
    ['Studies pooled (k)', (s) => String(s.k)],
    ['Estimate', (s) => f3(s.estimate)],
    ['Confidence interval', ci],
    ['τ²', (s) => (s.tau2 == null ? '—' : f3(s.tau2))],
  ];
  const cell = (s: ComparedResult, show: (s: Side) => string) => (s ? show(s) : 'nothing matches');
  return (
    <table className="max-w-2xl">
      <caption className="sr-only">Results then and now</caption>
      <thead>
        <tr>
          <th />
          <th className="num">{thenLabel}</th>
          <th className="num">Today’s registry</th>
        </tr>
      </thead>
      <tbody>
        {rows.map(([label, show]) => (
          <tr key={label}>
            <th scope="row" className="text-left font-normal">{label}</th>
            <td className="num">{cell(then, show)}</td>
            <td className="num">{cell(now, show)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const who = (e: Brief) => `${e.referenceLabel}, ${e.studyLabel}`;
const value = (e: Brief) => `${f3(e.effect)} (variance ${e.variance.toFixed(4)})`;

function EffectList({ title, items, mark }: { title: string; items: Brief[]; mark: string }) {
  if (items.length === 0) return null;
  return (
    <section aria-label={title}>
      <h3 className="text-sm">
        {mark} {title} ({items.length})
      </h3>
      <ul className="text-sm">
        {items.map((e) => (
          <li key={e.id}>
            {who(e)}: <span className="tabular-nums">{value(e)}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}

/** The effects added, withdrawn and corrected between the two sides. */
export function EffectChanges({ changes }: { changes: Changes }) {
  const { added, withdrawn, corrected, effectsRecorded } = changes;
  if (!effectsRecorded) return <EmptyState>The earlier effects were not kept for this follow, so only the results can be compared.</EmptyState>;
  if (added.length + withdrawn.length + corrected.length === 0) return <p className="text-sm">✓ No settled effect it pools has been added, withdrawn or corrected.</p>;
  return (
    <div className="flex flex-wrap gap-x-8 gap-y-2">
      <p className="basis-full text-xs text-ink-faint">Added and withdrawn also count effects that entered or left what the request matches (a corrected year, say).</p>
      <EffectList title="Added" items={added} mark="+" />
      <EffectList title="Withdrawn" items={withdrawn} mark="−" />
      {corrected.length > 0 && (
        <section aria-label="Corrected">
          <h3 className="text-sm">± Corrected ({corrected.length})</h3>
          <ul className="text-sm">
            {corrected.map((c) => (
              <li key={c.after.id}>
                {who(c.after)}: <span className="tabular-nums">{value(c.before)} → {value(c.after)}</span>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}

type Figure = ComponentType<{ figure: PlotFigure; name: string; label: string }>;

/** Both forest plots, then and now, side by side. */
export function ForestThenNow({ then, now, thenLabel, Figure, stem }: Pick<Changes, 'then' | 'now'> & { thenLabel: string; Figure: Figure; stem: string }) {
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      {[
        { side: then, label: `Forest plot, ${thenLabel.toLowerCase()}`, name: `${stem}-then-forest` },
        { side: now, label: 'Forest plot, today’s registry', name: `${stem}-now-forest` },
      ].map(({ side, label, name }) => (
        <div key={name}>
          {side?.forest ? <Figure figure={side.forest} name={name} label={label} /> : <EmptyState>No {label.toLowerCase()}: {side ? 'the earlier effects were not kept' : 'nothing to pool'}.</EmptyState>}
        </div>
      ))}
    </div>
  );
}
