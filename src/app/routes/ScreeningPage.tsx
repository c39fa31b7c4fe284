import { useMemo } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { OUTCOMES } from '../../../shared/vocabulary/outcomes';
import { SCREENING_STAGES, SCREENING_STAGE_LABELS } from '../../../shared/vocabulary/screening';
import { CURRENT_VOCABULARY, useManipulations } from '../../features/manipulations/api/get-manipulations';
import { stageFromParam } from '../../features/screening/api/get-queue';
import { useCounts } from '../../features/screening/api/get-counts';
import { ReadingList } from '../../features/screening/components/ReadingList';
import { StageProgress } from '../../features/screening/components/StageProgress';
import { RequireRole } from './RequireRole';

export function ScreeningPage() {
  const [params] = useSearchParams();
  const batch = Number(params.get('batch')) || undefined;
  const stage = stageFromParam(params.get('stage'));
  const counts = useCounts();
  const vocabulary = useManipulations(CURRENT_VOCABULARY);
  // Words marked in titles, abstracts and keywords: the manipulation vocabulary and the outcome kinds.
  const terms = useMemo(
    () => [...(vocabulary.data?.items ?? []).flatMap((m) => [m.label, m.term]), ...Object.values(OUTCOMES).map((o) => o.label)],
    [vocabulary.data],
  );
  const addressOf = (s: string) => `/screening?${new URLSearchParams({ ...(s === 'full_text' ? { stage: s } : {}), ...(batch ? { batch: String(batch) } : {}) })}`;
  return (
    <RequireRole role="contributor">
      <h1>Screening</h1>
      <nav aria-label="Screening stage" className="mb-2 flex flex-wrap gap-x-4 gap-y-1 text-sm">
        {SCREENING_STAGES.map((s, i) => {
          const waiting = counts.data?.stages[s].waiting;
          return (
            <Link key={s} to={addressOf(s)} aria-current={s === stage ? 'page' : undefined} className={s === stage ? 'font-semibold text-ink no-underline' : ''}>
              {i + 1}. {SCREENING_STAGE_LABELS[s]}
              {waiting === undefined ? '' : ` (${waiting} waiting)`}
            </Link>
          );
        })}
      </nav>
      <StageProgress stage={stage} />
      <p className="mb-3 text-sm text-ink-soft">
        {stage === 'title_abstract'
          ? 'Records included here go on to the full text; an exclusion may go without a reason. '
          : 'Reports included here can be coded; an exclusion needs a reason. '}
        <kbd>↑</kbd> <kbd>↓</kbd> move through the list · <kbd>Space</kbd> marks a record for a decision together with others · <kbd>Enter</kbd> decides
        (type the first letters of “include” or of a reason) · <kbd>U</kbd> takes back the last decision · <kbd>Esc</kbd> clears the marks. Marked words
        are terms of the <Link to="/manipulations">vocabulary</Link> and outcome kinds; every decision is kept in the reference’s history.
      </p>
      <ReadingList key={stage} stage={stage} batch={batch} terms={terms} />
    </RequireRole>
  );
}
