import { describe, expect, it } from 'vitest';
import { methodsParagraph, pooledQuantityOf, quantitySentence } from '../../../shared/synthesis/methods.js';
import { synthesisRequestSchema } from '../../../shared/schemas/synthesis.js';
import { SIGN_CONVENTIONS } from '../../../shared/vocabulary/parameters.js';

const pse = (signReversed: boolean) => ({ outcome: 'duration_distortion', parameter: 'pse', unit: 'ms', signReversed });

describe('methods paragraph: what was pooled and which way round', () => {
  it('counts the effects whose sign was reversed and names the parameter, unit and sign convention', () => {
    const q = pooledQuantityOf([pse(true), pse(false), pse(true), pse(false), pse(false)]);
    expect(q).toEqual({ outcomes: ['duration_distortion'], quantities: ['PSE (ms)'], effects: 5, signReversed: 2 });
    const text = quantitySentence(q);
    expect(text).toBe(
      ` The pooled parameter (unit) was PSE (ms), for duration distortion; sign convention: ${SIGN_CONVENTIONS.duration_distortion}.` +
        " Of the 5 effects, 2 had their sign reversed when coded, to keep this convention where a lower value meant lengthening in the study's task; the reported values were kept as reported.",
    );
  });

  it('says when no sign was reversed, and gives an effect coded before parameters its outcome kind’s usual one', () => {
    const q = pooledQuantityOf([{ outcome: 'temporal_order', parameter: null, unit: null }, { outcome: 'temporal_order' }]);
    expect(q.quantities).toEqual(['PSS (ms)']);
    expect(quantitySentence(q)).toBe(` The pooled parameter (unit) was PSS (ms), for temporal order; sign convention: ${SIGN_CONVENTIONS.temporal_order}. No effect's sign was reversed.`);
    expect(pooledQuantityOf([{ outcome: 'duration_distortion', parameter: 'weber_fraction', unit: 'percent', signReversed: true }]).quantities).toEqual(['Weber fraction (%)']);
    expect(quantitySentence(pooledQuantityOf([pse(true)]))).toContain(' The effect had its sign reversed when coded');
  });

  it('stands after the model sentences of the paragraph, and is left out when not given', () => {
    const base = {
      request: synthesisRequestSchema.parse({ filters: { manipulation: 'size' } }),
      metricLabel: "Hedges' g_s (independent groups)",
      counts: { effects: 5, studies: 5, references: 5 },
      software: { name: 'Chronometa', version: '0.1.0' },
      registryVersion: 3,
      prisma: null,
    };
    const text = methodsParagraph({ ...base, quantity: pooledQuantityOf([pse(true), pse(false)]) });
    expect(text.indexOf('The pooled parameter (unit) was PSE (ms)')).toBeGreaterThan(text.indexOf('Heterogeneity is reported'));
    expect(text.indexOf('Of the 2 effects, 1 had its sign reversed')).toBeLessThan(text.indexOf('Where a study reported several effects'));
    expect(methodsParagraph(base)).not.toContain('pooled parameter');
  });
});
