import { z } from 'zod';

/** A year typed into a filter: empty, or four digits. */
export const yearText = z.string().trim().regex(/^(\d{4})?$/, 'a year has four digits');

/** Text that should be a number: empty means "not given". */
export const numberOrNothing = (s: string) => (s.trim() === '' ? undefined : Number(s.trim()));

/**
 * A shared schema read as taking `I`: zod types a coerced field's input as `unknown`, which cannot close a
 * `.pipe()` from a form's own transform; the schema still checks (and coerces) exactly as on the server.
 */
export const taking =
  <I>() =>
  <S extends z.ZodType>(schema: S) =>
    schema as unknown as z.ZodType<z.output<S>, I>;

/** A field's text checked for its form, read as a number and checked by the server's own rule for that field. */
export const numericText = <S extends z.ZodType>(text: z.ZodString, serverRule: S) => text.transform(numberOrNothing).pipe(taking<number | undefined>()(serverRule));

/** Any number typed as text (empty is "not given"). */
export const numberText = z.string().trim().regex(/^(-?\d*\.?\d+)?$/, 'enter a number, such as 0.95');
