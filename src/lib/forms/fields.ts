import { z } from 'zod';

/** A year typed into a filter: empty, or four digits. */
export const yearText = z.string().trim().regex(/^(\d{4})?$/, 'a year has four digits');

/** Text that should be a number: empty means "not given". */
export const numberOrNothing = (s: string) => (s.trim() === '' ? undefined : Number(s.trim()));
