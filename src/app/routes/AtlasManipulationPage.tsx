import { Link, useParams } from 'react-router-dom';
import { ApiRequestError } from '../../lib/api-client';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { useAtlasManipulation } from '../../features/atlas/api/get-atlas-manipulation';
import { PooledCellSummary } from '../../features/atlas/components/PooledCellSummary';
import { ReferencesTable } from '../../features/atlas/components/ReferencesTable';
import { PlotFigure } from '../../features/plots/components/PlotFigure';
import { filtersHref } from '../../features/synthesis/codec';
import { NOT_CLINICAL } from '../../../shared/synthesis/cautions';
import { Caution } from '../../components/ui/Notice';

export function AtlasManipulationPage() {
  const { term = '' } = useParams();
  const { data, isLoading, error } = useAtlasManipulation(term);
  if (isLoading) return <Loading what="Pooling what is known" />;
  if (error)
    return (
      <div>
        <h1>Atlas</h1>
        <ErrorNote error={error instanceof ApiRequestError && error.status === 404 ? `“${term}” is not in the manipulation vocabulary.` : error} />
        <Link to="/atlas">Back to the atlas</Link>
      </div>
    );
  if (!data) return null;
  return (
    <article>
      <p className="text-sm">
        <Link to="/atlas">Atlas</Link> › manipulation
      </p>
      <h1>{data.manipulation.label}</h1>
      <p className="reading max-w-3xl">{data.manipulation.description || 'No description in the vocabulary yet.'}</p>
      <p className="text-sm tabular-nums text-ink-soft">
        {data.totals.references} references, {data.totals.studies} studies, {data.totals.effects} settled effects.
      </p>
      <Caution title="Not clinical guidance">{NOT_CLINICAL}</Caution>
      {data.cells.length === 0 && <EmptyState>No settled effects for this manipulation yet. Import and code a paper that manipulates it.</EmptyState>}
      {data.cells.map((c) => (
        <section key={`${c.outcome}-${c.parameter}-${c.unit}-${c.metric}`} aria-label={`${c.outcomeLabel}, ${c.metricLabel}`}>
          <h2>
            {c.outcomeLabel} <span className="font-normal text-ink-soft">· {c.quantityLabel ? `${c.quantityLabel} · ` : ''}{c.metricLabel}</span>
          </h2>
          <PooledCellSummary cell={c} heading="Current pooled estimate" openHref={filtersHref(c.filters)} />
          {c.forest && <PlotFigure figure={c.forest} name={`chronometa-atlas-${term}-${c.outcome}-${c.parameter ? `${c.parameter}-` : ''}${c.metric}-forest`} label="Forest plot" />}
        </section>
      ))}
      <h2>References</h2>
      <ReferencesTable scope="manipulations" slug={term} />
    </article>
  );
}
