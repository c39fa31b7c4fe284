import { cloneElement, useId, type ReactElement, type ReactNode } from 'react';

/** A field's message, in words, next to it (a symbol besides the colour). */
export function FieldError({ id, message, className = 'block text-xs text-refusal' }: { id?: string; message?: string; className?: string }) {
  if (!message) return null;
  return (
    <span id={id} className={className} role="alert">
      ✕ {message}
    </span>
  );
}

/**
 * A label, one control and its hint or error. The control gets the id, aria-invalid and aria-describedby, so
 * a screen reader reads the message with the field. The label is explicit (not wrapping), so a select's chosen
 * option never becomes part of its name.
 */
export function Field({
  label,
  error,
  hint,
  children,
  className = 'text-sm',
  labelClassName = 'block text-xs font-semibold text-ink-soft',
  errorClassName,
}: {
  label: ReactNode;
  error?: string;
  hint?: string;
  children: ReactElement<Record<string, unknown>>;
  className?: string;
  labelClassName?: string;
  errorClassName?: string;
}) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className={labelClassName}>
        {label}
      </label>
      {cloneElement(children, { id, 'aria-invalid': error ? true : undefined, 'aria-describedby': error ? `${id}-error` : hint ? `${id}-hint` : undefined })}
      {hint && !error && (
        <span id={`${id}-hint`} className="block text-xs text-ink-faint">
          {hint}
        </span>
      )}
      <FieldError id={`${id}-error`} message={error} className={errorClassName} />
    </div>
  );
}

/** The message at a dotted path of react-hook-form's errors ("filters.yearTo"). */
export function messageAt(errors: object, path: string): string | undefined {
  let cur: unknown = errors;
  for (const key of path.split('.')) cur = (cur as Record<string, unknown> | undefined)?.[key];
  const message = (cur as { message?: unknown } | undefined)?.message;
  return typeof message === 'string' ? message : undefined;
}
