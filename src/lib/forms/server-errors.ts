import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiRequestError } from '../api-client';
import { fieldProblemInWords } from './plain-words';

/**
 * Puts the server's field messages (400 answers) next to the fields they name; a message about anything else, or
 * a refusal without field details, goes to `root.server`. Returns whether the error was a refusal of the input.
 */
export function showServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, fields: readonly string[]): boolean {
  if (!(err instanceof ApiRequestError) || err.status !== 400) return false;
  const other: string[] = [];
  for (const [path, message] of Object.entries(err.fieldErrors())) {
    if (fields.includes(path)) setError(path as Path<T>, { type: 'server', message });
    else other.push(fieldProblemInWords(path, message));
  }
  if (other.length || !Object.keys(err.fieldErrors()).length) setError('root.server', { type: 'server', message: other.join(' ') || err.message });
  return true;
}
