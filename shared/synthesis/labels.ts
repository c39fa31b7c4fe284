import { labelOf } from '../vocabulary/labels.js';

/** A vocabulary value in words (the one label table in shared/vocabulary/labels.ts). */
export function valueLabel(kind: string, value: string): string {
  return labelOf(kind, value);
}
