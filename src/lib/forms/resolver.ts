import { zodResolver } from '@hookform/resolvers/zod';
import type { FieldValues, Resolver } from 'react-hook-form';
import type { z } from 'zod';
import { plainWords } from './plain-words';

/** A react-hook-form resolver for a zod schema, with plain-worded messages where the schema states none. */
export function formResolver<Input extends FieldValues, Output>(schema: z.ZodType<Output, Input>): Resolver<Input, unknown, Output> {
  return zodResolver(schema, { error: plainWords });
}

/**
 * A shared schema read as taking `I`: zod types a coerced field's input as `unknown`, which cannot close a
 * `.pipe()` from a form's own transform; the schema still checks (and coerces) exactly as on the server.
 */
export const taking =
  <I>() =>
  <S extends z.ZodType>(schema: S) =>
    schema as unknown as z.ZodType<z.output<S>, I>;
