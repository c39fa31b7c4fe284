import { z } from 'zod';
import { IMPORT_FORMATS, importRequestSchema } from '../../../../shared/schemas/references';
import type { ImportInput } from '../api/create-import';

/** A file, or pasted text checked like the server checks it. */
export const importFormSchema = z
  .object({ format: z.enum(IMPORT_FORMATS), text: z.string(), file: z.custom<FileList | null>().optional() })
  .superRefine((v, ctx) => {
    if (v.file?.length) return;
    if (!v.text.trim()) {
      ctx.addIssue({ code: 'custom', path: ['text'], message: v.format === 'doi' ? 'type at least one DOI' : 'paste at least one entry, or choose a file' });
      return;
    }
    const text = importRequestSchema.shape.text.safeParse(v.text);
    if (!text.success) ctx.addIssue({ code: 'custom', path: ['text'], message: text.error.issues[0].message });
  })
  .transform((v): ImportInput => (v.file?.length ? { format: v.format, file: v.file[0] } : { format: v.format, text: v.text }));
