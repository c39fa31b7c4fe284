import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Caution, ErrorNote, Loading } from '../../components/ui/Notice';
import { useExtraction } from '../../features/extraction/api/get-extraction';
import { useManipulations, WHOLE_VOCABULARY } from '../../features/manipulations/api/get-manipulations';
import { SheetForm } from '../../features/extraction/components/SheetForm';
import { SheetView } from '../../features/extraction/components/SheetView';
import { StateBadge } from '../../components/ui/StateBadge';
import { RequireRole } from './RequireRole';
import { PlotFigure } from '../../features/plots/components/PlotFigure';
import { TrialData } from '../../features/trials/components/TrialData';
import type { RenderPlot } from '../../features/trials/components/TrialSetPanel';

const renderPlot: RenderPlot = (figure, name, label) => <PlotFigure figure={figure} name={name} label={label} />;

export function ExtractionPage() {
  const id = Number(useParams().id);
  const { data, error, isLoading, refetch } = useExtraction(id);
  const [done, setDone] = useState<{ state: string; discrepancies: number } | null>(null);
  // The sheet's manipulation lists need the vocabulary before the form sets its values.
  const vocabulary = useManipulations(WHOLE_VOCABULARY);
  return (
    <RequireRole role="contributor">
      {isLoading && <Loading what="Opening the sheet" />}
      <ErrorNote error={error} />
      {data && (
        <>
          <h1>
            {data.extraction.kind === 'settled' ? `Settled record v${data.extraction.recordVersion}` : 'Extraction sheet'}: {data.extraction.reference.label}
          </h1>
          <p className="reading mb-1">{data.extraction.reference.title}</p>
          <p className="mb-3 text-sm text-ink-soft">
            <StateBadge state={data.extraction.state} /> {data.extraction.coder && <>coded by @{data.extraction.coder} · </>}version {data.extraction.version}
            {data.extraction.reference.doi && <> · DOI {data.extraction.reference.doi}</>} · <Link to={`/references/${data.extraction.referenceId}`}>reference</Link>
          </p>
          {data.extraction.reopenReason && <Caution title="Reopened">{data.extraction.reopenReason}</Caution>}
          {done && (
            <div role="status" className="my-2 rounded border border-paper-edge bg-white px-3 py-2 text-sm">
              {done.state === 'submitted' && '⇪ Submitted. The sheet is compared when the other coder submits.'}
              {done.state === 'settled' && '✓ Both codings agreed: the record is settled and part of the registry.'}
              {done.state === 'disputed' && `≠ The codings differ on ${done.discrepancies} field(s); a curator will reconcile them.`}
            </div>
          )}
          {data.extraction.editable && !done && vocabulary.isLoading && <Loading what="Loading the vocabulary" />}
          <ErrorNote error={vocabulary.error} />
          {data.extraction.editable && !done ? (
            vocabulary.data && (
              <SheetForm
                key={data.extraction.version}
                detail={data}
                terms={vocabulary.data.items}
                onSubmitted={(r) => (setDone(r), void refetch())}
                onReload={() => void refetch()}
                extras={(target) => <TrialData extractionId={id} editable target={target} renderPlot={renderPlot} />}
              />
            )
          ) : (
            <>
              <SheetView studies={data.studies} />
              {data.extraction.kind === 'coding' && <TrialData extractionId={id} editable={false} renderPlot={renderPlot} />}
            </>
          )}
        </>
      )}
    </RequireRole>
  );
}
