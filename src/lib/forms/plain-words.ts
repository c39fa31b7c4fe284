import type { z } from 'zod';

const count = (n: number | bigint, one: string, many: string) => `${n} ${n === 1 || n === 1n ? one : many}`;

/**
 * Zod's messages for checks a schema left unworded, said as a form says them ("must be above 0.5", "enter a
 * number"). Messages a schema states itself always win over these.
 */
export const plainWords: z.core.$ZodErrorMap = (issue) => {
  switch (issue.code) {
    case 'too_small':
      if (issue.origin === 'number' || issue.origin === 'int') return issue.inclusive ? `must be at least ${issue.minimum}` : `must be above ${issue.minimum}`;
      if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? 'fill this in' : `at least ${count(issue.minimum, 'character', 'characters')}`;
      if (issue.origin === 'array' || issue.origin === 'set') return `choose at least ${issue.minimum}`;
      return undefined;
    case 'too_big':
      if (issue.origin === 'number' || issue.origin === 'int') return issue.inclusive ? `must be at most ${issue.maximum}` : `must be below ${issue.maximum}`;
      if (issue.origin === 'string') return `at most ${count(issue.maximum, 'character', 'characters')}`;
      if (issue.origin === 'array' || issue.origin === 'set') return `at most ${issue.maximum}`;
      return undefined;
    case 'invalid_type':
      if (issue.input === undefined || issue.input === null || issue.input === '') return 'fill this in';
      if (issue.expected === 'number' || issue.expected === 'int') return 'enter a number';
      return undefined;
    case 'invalid_value':
      return 'choose one of the listed values';
    case 'invalid_format':
      return 'not in the expected form';
    default:
      return undefined;
  }
};
