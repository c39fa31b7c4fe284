import { z } from 'zod';
import { followThresholdsSchema } from '../../../../shared/schemas/following';
import { numberText, numericText } from '../../../lib/forms/fields';

/** Common practice, shown as the form's defaults: half the last SE, and a new study over 20% of the weight. */
export const DEFAULT_THRESHOLD_VALUES = { seShare: '0.5', weightPercent: '20' };

const percentText = numberText.refine((s) => s === '' || (Number(s) > 0 && Number(s) < 100), 'a percentage above 0 and below 100');

/** The two threshold fields as typed (the weight in percent) → the shares POST /api/follows takes. */
export const thresholdsFormSchema = z
  .object({
    seShare: numericText(numberText, followThresholdsSchema.shape.seShare),
    weightPercent: percentText.transform((s) => (s === '' ? undefined : Number(s) / 100)).pipe(followThresholdsSchema.shape.weightShare),
  })
  .transform(({ seShare, weightPercent }) => ({ seShare, weightShare: weightPercent }));
export type ThresholdsFormValues = z.input<typeof thresholdsFormSchema>;
