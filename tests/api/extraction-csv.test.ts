import { describe, expect, it } from 'vitest';
import { parseEffectsCsv } from '../../shared/extraction/csv.js';
import { computeReported } from '../../shared/extraction/compute.js';
import { OUTCOME_PARAMETERS, PARAMETERS, PARAMETER_LABELS, PARAMETER_UNITS, UNITS } from '../../shared/vocabulary/parameters.js';

describe('bulk CSV entry', () => {
  it('turns good rows into studies and effects and names every bad row by line', () => {
    const csv = [
      'study,design,n1_study,population,modality,task,standard_ms,label,outcome,manipulation,form,mean_diff,sd_diff,n,t,mean,sd',
      'Experiment 1,within,24,healthy_adults,visual,reproduction,600,bright vs dim,duration_distortion,luminance,smd_paired,40,80,24,,,',
      'Experiment 1,within,24,healthy_adults,visual,reproduction,600,large vs small,duration_distortion,size,smd_paired,,,24,2.9,,',
      'Experiment 2,within,18,healthy_adults,audiovisual,simultaneity_judgement,,window,simultaneity_window,loudness,raw_mean,,,18,,260,70',
      'Experiment 2,sideways,18,healthy_adults,audiovisual,simultaneity_judgement,,window,simultaneity_window,loudness,raw_mean,,,18,,260,70',
      'Experiment 3,within,18,healthy_adults,visual,bisection,,oops,duration_distortion,luminance,smd_paired,40,-5,18,,,',
    ].join('\n');
    const { rows, errors } = parseEffectsCsv(csv);
    expect(rows).toHaveLength(3);
    expect(rows[0].study).toMatchObject({ label: 'Experiment 1', design: 'within', n1: 24, standardMs: 600 });
    expect(rows[0].effect).toMatchObject({ manipulation: 'luminance', form: 'smd_paired', reported: { mean_diff: 40, sd_diff: 80, n: 24 } });
    const g = computeReported('smd_paired', rows[0].effect.reported as any, rows[0].effect.assumedR);
    expect(g.assumedR).toBe(0.5);
    expect(errors.map((e) => e.row)).toEqual([5, 6]);
    expect(errors[0].message).toMatch(/design/);
    expect(errors[1].message).toMatch(/sd_diff must be a positive finite number/);
  });

  it('takes parameter and unit columns, and names each row whose parameter or unit is not allowed', () => {
    const head = 'study,design,n1_study,population,modality,task,label,outcome,parameter,unit,manipulation,form,mean_diff,sd_diff,n';
    const csv = [
      head,
      'Experiment 1,within,20,healthy_adults,visual,bisection,pse shift,duration_distortion,pse,ms,luminance,mean_diff,-30,60,20',
      'Experiment 1,within,20,healthy_adults,visual,bisection,ratio,duration_distortion,,,luminance,mean_diff,-30,60,20',
      'Experiment 1,within,20,healthy_adults,visual,bisection,wrong kind,duration_distortion,pss,ms,luminance,mean_diff,-30,60,20',
      'Experiment 1,within,20,healthy_adults,visual,bisection,wrong unit,duration_distortion,pse,deg,luminance,mean_diff,-30,60,20',
      'Experiment 1,within,20,healthy_adults,visual,bisection,unknown,duration_distortion,pse,furlongs,luminance,mean_diff,-30,60,20',
      'Experiment 1,within,20,healthy_adults,visual,bisection,unknown,duration_distortion,tempo,ms,luminance,mean_diff,-30,60,20',
    ].join('\n');
    const { rows, errors } = parseEffectsCsv(csv);
    expect(rows.map((r) => [r.effect.label, r.effect.parameter, r.effect.unit])).toEqual([
      ['pse shift', 'pse', 'ms'],
      // blank: the outcome kind's usual ones, as on the sheet
      ['ratio', undefined, undefined],
    ]);
    expect(errors).toEqual([
      {
        row: 4,
        message: `parameter: Duration distortion records ${OUTCOME_PARAMETERS.duration_distortion.map((k) => PARAMETER_LABELS[k]).join(', ')}, not PSS (allowed: ${OUTCOME_PARAMETERS.duration_distortion.map((k) => `parameter ${k} with unit ${PARAMETER_UNITS[k][0]}`).join('; ')}; outcome temporal_order; outcome recalibration_shift)`,
      },
      { row: 5, message: 'unit: PSE is measured in ms, not deg (allowed: unit ms)' },
      { row: 6, message: `unit: “furlongs” is not one of ${UNITS.join(', ')}` },
      { row: 7, message: `parameter: “tempo” is not one of ${PARAMETERS.join(', ')}` },
    ]);
  });

  it('refuses unknown columns', () => {
    const { errors } = parseEffectsCsv('study,colour\nExperiment 1,red');
    expect(errors[0]).toMatchObject({ row: 1, message: expect.stringMatching(/unknown column: colour/) });
  });
});
