import { useMemo } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { OUTCOMES } from '../../../shared/vocabulary/outcomes';
import { CURRENT_VOCABULARY, useManipulations } from '../../features/manipulations/api/get-manipulations';
import { ReadingList } from '../../features/screening/components/ReadingList';
import { StageProgress } from '../../features/screening/components/StageProgress';
import { RequireRole } from './RequireRole';

export function ScreeningPage() {
  const [params] = useSearchParams();
  const batch = Number(params.get('batch')) || undefined;
  const vocabulary = useManipulations(CURRENT_VOCABULARY);
  // Words marked in titles, abstracts and keywords: the manipulation vocabulary and the outcome kinds.
  const terms = useMemo(
    () => [...(vocabulary.data?.items ?? []).flatMap((m) => [m.label, m.term]), ...Object.values(OUTCOMES).map((o) => o.label)],
    [vocabulary.data],
  );
  return (
    <RequireRole role="contributor">
      <h1>Screening</h1>
      <StageProgress />
      <p className="mb-3 text-sm text-ink-soft">
        <kbd>↑</kbd> <kbd>↓</kbd> move through the list · <kbd>Space</kbd> marks a record for a decision together with others · <kbd>Enter</kbd> decides
        (type the first letters of “include” or of a reason) · <kbd>U</kbd> takes back the last decision · <kbd>Esc</kbd> clears the marks. Marked words
        are terms of the <Link to="/manipulations">vocabulary</Link> and outcome kinds; every decision is kept in the reference’s history.
      </p>
      <ReadingList batch={batch} terms={terms} />
    </RequireRole>
  );
}
