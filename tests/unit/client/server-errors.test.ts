import { describe, expect, it } from 'vitest';
import { ApiRequestError } from '../../../src/lib/api-client';
import { showServerErrors } from '../../../src/lib/forms/server-errors';
import { pathLikeIn } from '../../support/words.js';

/** Collects what showServerErrors puts on a form. */
function shown(err: unknown, fields: string[]) {
  const set: Record<string, string> = {};
  const handled = showServerErrors(err, ((name: string, e: { message?: string }) => (set[name] = e.message ?? '')) as never, fields);
  return { handled, set };
}

describe('a 400 shown on a form', () => {
  it('puts field messages beside their fields and says the others in words, never as paths', () => {
    const err = new ApiRequestError(400, 'invalid_input', 'Page size: must be at most 200 (and 2 more).', [
      { path: 'body.name', message: 'give the token a name' },
      { path: 'body.filters.yearFrom', message: 'enter a number' },
      { path: 'body.studies.0.effects.1.sd1', message: 'must be above 0' },
    ]);
    const { handled, set } = shown(err, ['name']);
    expect(handled).toBe(true);
    expect(set.name).toBe('give the token a name');
    expect(set['root.server']).toBe('From year: enter a number. Study 1, effect 2, SD of group 1: must be above 0.');
    expect(pathLikeIn(set['root.server']!)).toEqual([]);
  });

  it('shows the refusal’s own message when it names no field, and leaves other errors alone', () => {
    expect(shown(new ApiRequestError(400, 'invalid_input', 'Give the token a name.'), []).set).toEqual({ 'root.server': 'Give the token a name.' });
    expect(shown(new ApiRequestError(409, 'conflict', 'changed'), []).handled).toBe(false);
  });
});
