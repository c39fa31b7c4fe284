import { Link, useParams } from 'react-router-dom';
import { ApiRequestError } from '../../lib/api-client';
import { Caution, EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { useAtlasOutcome } from '../../features/atlas/api/get-atlas-outcome';
import { filtersHref } from '../../features/synthesis/codec';
import { ReferencesTable } from '../../features/atlas/components/ReferencesTable';
import { NOT_CLINICAL } from '../../../shared/synthesis/cautions';
import { digitsFor, fixed, interval } from '../../lib/format';

export function AtlasOutcomePage() {
  const { kind = '' } = useParams();
  const { data, isLoading, error } = useAtlasOutcome(kind);
  if (isLoading) return <Loading what="Pooling what is known" />;
  if (error)
    return (
      <div>
        <h1>Atlas</h1>
        <ErrorNote error={error instanceof ApiRequestError && error.status === 404 ? `“${kind}” is not an outcome kind.` : error} />
        <Link to="/atlas">Back to the atlas</Link>
      </div>
    );
  if (!data) return null;
  return (
    <article>
      <p className="text-sm">
        <Link to="/atlas">Atlas</Link> › outcome kind
      </p>
      <h1>{data.outcome.label}</h1>
      <p className="reading max-w-3xl">
        Typically reported as {data.outcome.typicalReport}; pooled as {data.outcome.metricLabels.join(' or ')}.
      </p>
      <p className="text-sm tabular-nums text-ink-soft">
        {data.totals.references} references, {data.totals.studies} studies, {data.totals.effects} settled effects.
      </p>
      <Caution title="Not clinical guidance">{NOT_CLINICAL}</Caution>
      <h2>Pooled estimates by manipulation</h2>
      {data.cells.length === 0 ? (
        <EmptyState>No settled effects of this kind yet.</EmptyState>
      ) : (
        <table>
          <caption className="caption-top pb-1 text-left text-sm text-ink-soft">DerSimonian–Laird random effects, effects within a study combined with r = 0.50; ms metrics to 1 decimal, others to 3</caption>
          <thead>
            <tr>
              <th>Manipulation</th>
              <th>Metric</th>
              <th className="num">Studies</th>
              <th className="num">Effects</th>
              <th className="num">Estimate</th>
              <th className="num">95% CI</th>
              <th className="num">Prediction interval</th>
              <th className="num">I² %</th>
              <th>Cautions</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {data.cells.map((c) => {
              const d = digitsFor(c.metric);
              return (
                <tr key={`${c.manipulation}-${c.parameter}-${c.unit}-${c.metric}`}>
                  <td>
                    <Link to={`/atlas/manipulations/${c.manipulation}`}>{c.manipulationLabel}</Link>
                  </td>
                  <td>
                    {c.quantityLabel ? `${c.quantityLabel} · ` : ''}
                    {c.metricLabel}
                  </td>
                  <td className="num">{c.counts.studies}</td>
                  <td className="num">{c.counts.effects}</td>
                  <td className="num">
                    <strong>{fixed(c.pooled.estimate, d)}</strong>
                  </td>
                  <td className="num">
                    {interval(c.pooled.ci_lower, c.pooled.ci_upper, d)}
                  </td>
                  <td className="num">{interval(c.pooled.pi_lower, c.pooled.pi_upper, d)}</td>
                  <td className="num">{fixed(c.pooled.I2, 1)}</td>
                  <td className="text-xs">{c.cautions.length ? `⚠ ${c.cautions.map((x) => x.code === 'few_studies_dl' ? 'few studies' : x.code === 'few_studies_tests' ? 'under 10 studies' : x.code === 'high_heterogeneity' ? 'I² > 75%' : 'one study').join('; ')}` : '—'}</td>
                  <td>
                    <Link to={filtersHref(c.filters)}>Synthesis →</Link>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
      <h2>References</h2>
      <ReferencesTable scope="outcomes" slug={kind} />
    </article>
  );
}
