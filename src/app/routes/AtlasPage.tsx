import { Link } from 'react-router-dom';
import { Caution, EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { useAtlas } from '../../features/atlas/api/get-atlas';
import { EstimateList } from '../../features/atlas/components/EstimateList';
import { filtersHref } from '../../features/synthesis/codec';
import { labelOf } from '../../../shared/vocabulary/labels';
import { NOT_CLINICAL } from '../../../shared/synthesis/cautions';

export function AtlasPage() {
  const { data, isLoading, error } = useAtlas();
  return (
    <div>
      <h1>Atlas</h1>
      <p className="reading mb-3 max-w-3xl">
        What the registry knows, by manipulation and by outcome kind: each page gives the current pooled estimate from settled effects, its forest plot and the
        papers behind it.
      </p>
      <Caution title="Not clinical guidance">{NOT_CLINICAL}</Caution>
      {isLoading && <Loading what="Loading the atlas" />}
      <ErrorNote error={error} />
      {data && (
        <>
          <p className="text-sm tabular-nums text-ink-soft">
            {data.totals.effects} settled effects from {data.totals.studies} studies in {data.totals.references} references.
          </p>
          {data.totals.effects === 0 && <EmptyState>No settled effects yet: once curators settle coded papers, their manipulations appear here with pooled estimates.</EmptyState>}
          <h2>By manipulation</h2>
          <table>
            <thead>
              <tr>
                <th>Manipulation</th>
                <th>What varies</th>
                <th className="num">References</th>
                <th className="num">Studies</th>
                <th className="num">Effects</th>
                <th>Outcome kinds</th>
                <th>Current estimates (k, sign convention)</th>
              </tr>
            </thead>
            <tbody>
              {data.manipulations.map((m) => (
                <tr key={m.term}>
                  <td>{m.effects ? <Link to={`/atlas/manipulations/${m.term}`}>{m.label}</Link> : <span>{m.label}</span>}</td>
                  <td className="text-ink-soft">{m.description}</td>
                  <td className="num">{m.references}</td>
                  <td className="num">{m.studies}</td>
                  <td className="num">{m.effects}</td>
                  <td>{m.outcomes.length ? m.outcomes.map((o) => labelOf('outcome', o)).join(', ') : <span className="text-ink-faint">none coded yet</span>}</td>
                  <td>
                    <EstimateList cells={m.estimates} hrefOf={(c) => filtersHref(c.filters)} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <h2>By outcome kind</h2>
          <table>
            <thead>
              <tr>
                <th>Outcome kind</th>
                <th>Typically reported as</th>
                <th className="num">References</th>
                <th className="num">Studies</th>
                <th className="num">Effects</th>
                <th>Metrics pooled</th>
              </tr>
            </thead>
            <tbody>
              {data.outcomes.map((o) => (
                <tr key={o.kind}>
                  <td>{o.effects ? <Link to={`/atlas/outcomes/${o.kind}`}>{o.label}</Link> : o.label}</td>
                  <td className="text-ink-soft">{o.typicalReport}</td>
                  <td className="num">{o.references}</td>
                  <td className="num">{o.studies}</td>
                  <td className="num">{o.effects}</td>
                  <td>{o.metrics.map((m) => labelOf('metric', m)).join(', ') || '—'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </div>
  );
}
