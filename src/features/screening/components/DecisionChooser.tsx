import { useId, useState, type KeyboardEvent } from 'react';
import { Button } from '../../../components/ui/Button';
import { ErrorNote } from '../../../components/ui/Notice';
import type { ScreeningStage } from '../../../../shared/vocabulary/screening';
import { choiceKey, choiceLabel, filterChoices, type Choice } from '../choices';

const line = (c: Choice) => (c.decision === 'included' ? `✓ ${choiceLabel(c)}` : `✕ Exclude: ${choiceLabel(c)}`);

/**
 * The decision for one record or several marked ones: type the first letters of "include" or of a reason, pick
 * with ↑ ↓ and Enter, add a note if wanted (required for "Other"), Enter saves. Esc steps back, then closes.
 */
export function DecisionChooser({
  stage,
  count,
  marked,
  pending,
  error,
  onSave,
  onClose,
}: {
  /** The stage decided at: its own reasons are offered. */
  stage: ScreeningStage;
  count: number;
  /** The decision is for the marked records (else for the one being read). */
  marked: boolean;
  pending: boolean;
  error: unknown;
  onSave: (choice: Choice, note: string) => void;
  onClose: () => void;
}) {
  const id = useId();
  const [typed, setTyped] = useState('');
  const [active, setActive] = useState(0);
  const [picked, setPicked] = useState<Choice | null>(null);
  const [note, setNote] = useState('');
  const [noteMissing, setNoteMissing] = useState(false);
  const lines = filterChoices(typed, stage);
  const at = Math.min(active, Math.max(lines.length - 1, 0));
  const needsNote = picked?.decision === 'excluded' && picked.reason === 'other';

  const onTypedKey = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
      e.preventDefault();
      if (lines.length) setActive((at + (e.key === 'ArrowDown' ? 1 : lines.length - 1)) % lines.length);
    } else if (e.key === 'Enter') {
      e.preventDefault();
      if (lines[at]) setPicked(lines[at]);
    } else if (e.key === 'Escape') {
      e.preventDefault();
      onClose();
    }
  };
  const save = () => {
    if (!picked || pending) return;
    if (needsNote && !note.trim()) return setNoteMissing(true);
    onSave(picked, note.trim());
  };

  return (
    <section aria-label="Decision" className="rounded border border-action bg-white p-3 text-sm shadow-sm">
      <h3 className="mt-0 text-base">{marked ? `Decide the ${count} marked ${count === 1 ? 'record' : 'records'}` : 'Decide this record'}</h3>
      {!picked ? (
        <>
          <label htmlFor={`${id}-typed`} className="block">
            Type the first letters of a decision or reason
          </label>
          <input
            id={`${id}-typed`}
            role="combobox"
            aria-expanded="true"
            aria-controls={`${id}-lines`}
            aria-activedescendant={lines[at] ? `${id}-${choiceKey(lines[at])}` : undefined}
            autoComplete="off"
            autoFocus
            className="mt-1 w-full rounded border border-paper-edge bg-white px-2 py-1"
            value={typed}
            onChange={(e) => (setTyped(e.target.value), setActive(0))}
            onKeyDown={onTypedKey}
          />
          <ul id={`${id}-lines`} role="listbox" aria-label="Decisions" className="mt-1 list-none pl-0">
            {lines.map((c, i) => (
              <li
                key={choiceKey(c)}
                id={`${id}-${choiceKey(c)}`}
                role="option"
                aria-selected={i === at}
                className={`cursor-pointer rounded px-2 py-0.5 ${i === at ? 'bg-action-light font-semibold' : ''}`}
                onMouseDown={(e) => (e.preventDefault(), setPicked(c))}
              >
                {line(c)}
              </li>
            ))}
          </ul>
          {!lines.length && <p className="text-refusal">✕ Nothing starts with “{typed.trim()}”.</p>}
          <p className="mt-1 text-xs text-ink-faint">↑ ↓ pick · Enter choose · Esc back to the list</p>
        </>
      ) : (
        <form
          onSubmit={(e) => {
            e.preventDefault();
            save();
          }}
          noValidate
        >
          <p className="my-1">
            <strong>{line(picked)}</strong>{' '}
            <button type="button" className="text-xs underline" onClick={() => setPicked(null)}>
              change
            </button>
          </p>
          <label htmlFor={`${id}-note`} className="block">
            Note {needsNote ? '(required for “Other”)' : '(optional)'}
          </label>
          <input
            id={`${id}-note`}
            autoFocus
            className="mt-1 w-full rounded border border-paper-edge bg-white px-2 py-1"
            value={note}
            aria-invalid={noteMissing && !note.trim()}
            aria-describedby={`${id}-note-error`}
            onChange={(e) => setNote(e.target.value)}
            onKeyDown={(e) => {
              if (e.key !== 'Escape') return;
              e.preventDefault();
              setPicked(null);
            }}
          />
          {noteMissing && !note.trim() && (
            <p id={`${id}-note-error`} className="text-refusal">
              ✕ Say why, when the reason is “Other”.
            </p>
          )}
          <div className="mt-2">
            <Button type="submit" variant="primary" disabled={pending}>
              {pending ? 'Saving…' : marked ? `Save for ${count} marked` : 'Save decision'}
            </Button>
            <span className="ml-2 text-xs text-ink-faint">Enter saves · Esc changes the choice</span>
          </div>
        </form>
      )}
      <ErrorNote error={error} />
    </section>
  );
}
