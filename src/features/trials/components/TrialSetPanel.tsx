import { useState, type ReactNode } from 'react';
import { proportionsFigure } from '../../../../shared/plots/psychometric';
import type { PlotFigure } from '../../../../shared/synthesis/types';
import { TRIAL_TASK_LABELS } from '../../../../shared/trials/fits';
import { Button } from '../../../components/ui/Button';
import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { useTrialSet } from '../api/get-trial-set';
import { useStartFits } from '../api/start-fits';
import { ContrastChooser, type SheetTarget } from './ContrastChooser';
import { FitTable } from './FitTable';

export type RenderPlot = (figure: PlotFigure, name: string, label: string) => ReactNode;

const RESPONSE_LABEL = { order: 'proportion "second first"', duration: 'proportion "comparison longer"', simultaneity: 'proportion "simultaneous"' } as const;

/** One uploaded data set: its fit job's progress, the fit table with flags, a participant's curves, the effect. */
export function TrialSetPanel({ setId, target, renderPlot }: { setId: number; target?: SheetTarget; renderPlot: RenderPlot }) {
  const { data, error, isLoading } = useTrialSet(setId);
  const starter = useStartFits();
  const [participant, setParticipant] = useState<string | null>(null);
  if (isLoading) return <Loading what="Opening the data set" />;
  if (!data) return <ErrorNote error={error} />;
  const { set, fits, flagged } = data;
  const running = set.fit.state === 'queued' || set.fit.state === 'running';
  const shown = participant ?? fits[0]?.participant ?? null;
  const cells = fits.filter((f) => f.participant === shown);
  const participants = [...new Set(fits.map((f) => f.participant))];
  return (
    <article className="mt-3 rounded border border-paper-edge bg-white/40 p-3" aria-label={`Trial data: ${set.label}`}>
      <header className="flex flex-wrap items-baseline gap-x-3">
        <h3 className="text-base font-bold">{set.label}</h3>
        <span className="text-xs text-ink-soft">
          {TRIAL_TASK_LABELS[set.task]} · {set.participants} participants · conditions {set.conditions.join(', ')} · {set.trials.toLocaleString('en')} trials
          {set.format === 'counts' ? ' (counts per level)' : ''} · levels {set.levelMin} to {set.levelMax} ms · {set.fileName}
        </span>
        <a className="ml-auto text-xs" href={`/api/trial-sets/${set.id}/trials.csv`} download>
          ↓ Trials as CSV
        </a>
      </header>
      {set.fit.state === 'none' && set.editable && (
        <Button className="mt-2" onClick={() => starter.mutate({ setId: set.id, resamples: 1000 })} disabled={starter.isPending}>
          Fit the data (1,000 resamples)
        </Button>
      )}
      {set.fit.state === 'none' && !set.editable && <p className="mt-2 text-sm text-ink-soft">Not fitted yet.</p>}
      {running && (
        <div className="mt-2 text-sm" role="status" aria-live="polite">
          <label className="block">
            ◌ {set.fit.state === 'queued' ? 'Waiting for the fitting queue' : `Fitting participant × condition ${set.fit.done} of ${set.fit.total}`} ({set.fit.resamples?.toLocaleString('en')} bootstrap
            resamples each)
            <progress className="mt-1 block h-1.5 w-full" max={Math.max(1, set.fit.total)} value={set.fit.done} />
          </label>
        </div>
      )}
      {set.fit.state === 'failed' && (
        <>
          <ErrorNote error={set.fit.error ?? 'the fits failed'} title="The fits failed" />
          {set.editable && <Button onClick={() => starter.mutate({ setId: set.id, resamples: set.fit.resamples ?? 1000 })}>Fit again</Button>}
        </>
      )}
      <ErrorNote error={starter.error} />
      {set.fit.state === 'done' && (
        <>
          <p className="mt-2 text-sm" data-testid="fit-summary">
            ✓ {fits.length} fits ({set.fit.resamples?.toLocaleString('en')} resamples each)
            {flagged.notConverged + flagged.outsideRange + flagged.plausibility === 0
              ? ', nothing flagged.'
              : `: ${flagged.notConverged} did not converge, ${flagged.outsideRange} outside the tested range, ${flagged.plausibility} with a plausibility warning (common practice).`}
          </p>
          <FitTable task={set.task} fits={fits} selected={shown} onSelect={setParticipant} />
          {shown && (
            <div className="mt-2">
              <label className="text-xs font-semibold text-ink-soft">
                Participant shown{' '}
                <select className="ml-1 rounded border border-paper-edge bg-white px-2 py-0.5 text-sm" value={shown} onChange={(e) => setParticipant(e.target.value)}>
                  {participants.map((p) => (
                    <option key={p}>{p}</option>
                  ))}
                </select>
              </label>
              {renderPlot(
                proportionsFigure({ title: `${set.label}: participant ${shown}`, responseLabel: RESPONSE_LABEL[set.task], cells }),
                `trial-set-${set.id}-${shown}`,
                `Observed proportions and fitted curves, participant ${shown}`,
              )}
            </div>
          )}
          <ContrastChooser set={set} target={target} />
        </>
      )}
    </article>
  );
}
