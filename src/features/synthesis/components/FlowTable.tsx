import type { SynthesisFlow } from '../../../../shared/synthesis/flow';
import { referenceSourceLabel } from '../../../../shared/vocabulary/screening';

const int = (x: number) => x.toLocaleString('en-GB');

/** The flow of records into one synthesis (PRISMA 2020), stage by stage, as a table beside its diagram. */
export function FlowTable({ flow }: { flow: SynthesisFlow }) {
  const e = flow.entering;
  return (
    <div className="overflow-x-auto">
      <table className="max-w-2xl" aria-label="Flow of records into this synthesis">
        <thead>
          <tr>
            <th scope="col">Step</th>
            <th scope="col" className="num">References</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <td>Records identified in the registry</td>
            <td className="num">{int(flow.identified.total)}</td>
          </tr>
          {Object.entries(flow.identified.bySource).map(([source, n]) => (
            <tr key={source}>
              <td className="pl-6 text-ink-soft">{referenceSourceLabel(source)}</td>
              <td className="num">{int(n)}</td>
            </tr>
          ))}
          <tr>
            <td>Duplicates removed (entries at import, references merged)</td>
            <td className="num">{int(flow.duplicatesRemoved.total)}</td>
          </tr>
          {flow.stages.map((s) => (
            <FlowStageRows key={s.stage} stage={s} />
          ))}
          <tr>
            <td>
              <strong>Entering this synthesis</strong> ({int(e.studies)} {e.studies === 1 ? 'study' : 'studies'}, {int(e.effects)} {e.effects === 1 ? 'effect' : 'effects'})
            </td>
            <td className="num">
              <strong>{int(e.references)}</strong>
            </td>
          </tr>
        </tbody>
      </table>
    </div>
  );
}

function FlowStageRows({ stage: s }: { stage: SynthesisFlow['stages'][number] }) {
  return (
    <>
      <tr>
        <td>{s.label}</td>
        <td className="num">{int(s.entered)}</td>
      </tr>
      {s.excluded > 0 && (
        <tr>
          <td className="pl-6">{s.stage === 'synthesis' ? 'Outside the filters' : 'Excluded'}</td>
          <td className="num">{int(s.excluded)}</td>
        </tr>
      )}
      {s.excludedByReason.map((r) => (
        <tr key={r.reason}>
          <td className="pl-10 text-ink-soft">{r.label}</td>
          <td className="num">{int(r.count)}</td>
        </tr>
      ))}
      {s.pendingLabel && (
        <tr>
          <td className="pl-6">{s.pendingLabel[0].toUpperCase() + s.pendingLabel.slice(1)}</td>
          <td className="num">{int(s.pending)}</td>
        </tr>
      )}
    </>
  );
}
