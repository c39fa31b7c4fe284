import { describe, expect, it } from 'vitest';
import { EXCLUSION_REASONS } from '../../../shared/vocabulary/screening';
import { decisionDefaults, decisionFormSchema } from '../../../src/features/screening/forms/decision';

describe('the screening form starts from the current decision', () => {
  it('starts as an inclusion with nothing written when the reference is undecided', () => {
    expect(decisionDefaults(undefined)).toEqual({ decision: 'included', reason: '', note: '' });
    expect(decisionDefaults(null)).toEqual({ decision: 'included', reason: '', note: '' });
  });

  it('keeps an exclusion with its reason and note, and submits them unchanged', () => {
    const reason = EXCLUSION_REASONS[1];
    const start = decisionDefaults({ decision: 'excluded', reason, note: 'adults only' });
    expect(start).toEqual({ decision: 'excluded', reason, note: 'adults only' });
    expect(decisionFormSchema('title_abstract').parse(start)).toEqual({ decision: 'excluded', reason, note: 'adults only', stage: 'title_abstract' });
  });

  it('keeps an inclusion with its note and no reason', () => {
    expect(decisionDefaults({ decision: 'included', reason: null, note: null })).toEqual({ decision: 'included', reason: '', note: '' });
    expect(decisionDefaults({ decision: 'included', reason: null, note: 'full text read' })).toEqual({ decision: 'included', reason: '', note: 'full text read' });
  });
});
