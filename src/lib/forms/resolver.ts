import { zodResolver } from '@hookform/resolvers/zod';
import type { FieldValues, Resolver } from 'react-hook-form';
import type { z } from 'zod';
import { plainWords } from './plain-words';

/** A react-hook-form resolver for a zod schema, with plain-worded messages where the schema states none. */
export function formResolver<Input extends FieldValues, Output>(schema: z.ZodType<Output, Input>): Resolver<Input, unknown, Output> {
  return zodResolver(schema, { error: plainWords });
}

