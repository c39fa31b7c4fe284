import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { useTrialSets } from '../api/get-trial-sets';
import type { SheetTarget } from './ContrastChooser';
import { TrialSetPanel, type RenderPlot } from './TrialSetPanel';
import { TrialUploadForm } from './TrialUploadForm';

/**
 * A sheet's trial data: upload, fits, and effects coded from them. `target` is the open sheet (absent when
 * reading); plots are drawn by the caller (the plot feature).
 */
export function TrialData({ extractionId, editable, target, renderPlot }: { extractionId: number; editable: boolean; target?: SheetTarget; renderPlot: RenderPlot }) {
  const { data, error, isLoading } = useTrialSets(extractionId);
  // Reading someone else's sheet (refused) or a sheet without trial data: nothing to show.
  if (!editable && (error || data?.items.length === 0)) return null;
  return (
    <section className="mt-6 rounded border border-paper-edge p-3" aria-labelledby="trial-data-heading">
      <h2 id="trial-data-heading" className="text-lg font-bold">
        Trial data
      </h2>
      <p className="text-xs text-ink-soft">
        Add from trial data: psychometric functions (order and duration judgements) or simultaneity windows are fitted per participant and condition, and the
        difference between two conditions is coded with the correlation these data show. Trial data are seen by the coder of this sheet and by curators until the
        record is settled; after that they come with the snapshots that use them.
      </p>
      {isLoading && <Loading what="Loading the trial data" />}
      <ErrorNote error={error} />
      {editable && <TrialUploadForm extractionId={extractionId} />}
      {data?.items.map((s) => <TrialSetPanel key={s.id} setId={s.id} target={target} renderPlot={renderPlot} />)}
    </section>
  );
}
