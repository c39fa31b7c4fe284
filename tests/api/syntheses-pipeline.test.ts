import { describe, expect, it } from 'vitest';
import { pool } from '../../shared/stats/pool.js';
import { runSynthesis, MixedMetricsError, NoEffectsError } from '../../shared/synthesis/run.js';
import { applyDependence } from '../../shared/synthesis/dependence.js';
import { synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import { methodsParagraph } from '../../shared/synthesis/methods.js';
import { forestFigure } from '../../shared/plots/forest.js';
import type { SettledEffect } from '../../shared/synthesis/types.js';

// Invented effects: 8 studies of a made-up "luminance" manipulation, study 3 with two effects.
const base = { outcome: 'duration_distortion', manipulation: 'luminance', metric: 'g_s', design: 'within', population: 'healthy_adults', modality: 'visual', task: 'reproduction' };
const effects: SettledEffect[] = [
  [1, 1, 0.31, 0.04, 2011, 20, 500],
  [2, 2, 0.12, 0.03, 2013, 24, 800],
  [3, 3, 0.45, 0.05, 2014, 16, 600],
  [4, 3, 0.25, 0.06, 2014, 16, 1200],
  [5, 4, 0.05, 0.02, 2016, 40, 700],
  [6, 5, 0.6, 0.09, 2018, 12, 400],
  [7, 6, 0.22, 0.025, 2019, 30, 1000],
  [8, 7, -0.1, 0.07, 2020, 14, 900],
  [9, 8, 0.35, 0.035, 2022, 28, 650],
].map(([id, study, effect, variance, year, n, ms]) => ({
  ...base,
  id, studyId: study, referenceId: study, studyLabel: 'Exp. 1', referenceLabel: `Invented ${year}`, year, n, effect, variance, standardMs: ms,
}));
const request = (over: Record<string, unknown> = {}) => synthesisRequestSchema.parse({ filters: { manipulation: 'luminance' }, ...over });

describe('synthesis pipeline (pure, over rows)', () => {
  it('pools exactly the returned rows with the engine, one row per study', () => {
    const out = runSynthesis(effects, request());
    expect(out.rows).toHaveLength(8);
    expect(out.counts).toEqual({ effects: 9, studies: 8, references: 8 });
    const direct = pool({ effects: out.rows.map((r) => r.effect), variances: out.rows.map((r) => r.variance), method: 'DL', hksj: false, level: 0.95 });
    expect(out.result.estimate).toBeCloseTo(direct.estimate, 12);
    expect(out.result.tau2).toBeCloseTo(direct.tau2!, 12);
    expect(out.result.I2).toBeCloseTo(direct.I2!, 12);
    expect(out.rows.reduce((s, r) => s + r.weight, 0)).toBeCloseTo(100, 9);
  });

  it('aggregates a study with r (composite variance between the two extremes) or keeps one by rule', () => {
    const agg = applyDependence(effects, { mode: 'aggregate', r: 0.5 }).find((u) => u.studyId === 3)!;
    expect(agg.effect).toBeCloseTo(0.35, 12);
    // (0.05 + 0.06 + 2·0.5·√(0.05·0.06))/4
    expect(agg.variance).toBeCloseTo((0.05 + 0.06 + Math.sqrt(0.003)) / 4, 12);
    const independent = applyDependence(effects, { mode: 'aggregate', r: 0 }).find((u) => u.studyId === 3)!;
    expect(independent.variance).toBeLessThan(agg.variance);
    const one = applyDependence(effects, { mode: 'one', rule: 'smallest_variance' }).find((u) => u.studyId === 3)!;
    expect(one.effect).toBe(0.45);
    expect(one.effects.map((e) => e.id)).toEqual([3]);
  });

  it('refuses mixed metrics naming both, and an empty set', () => {
    const mixed = [...effects, { ...effects[0], id: 99, studyId: 99, metric: 'log_ratio' }];
    expect(() => runSynthesis(mixed, request())).toThrow(MixedMetricsError);
    expect(() => runSynthesis(mixed, request())).toThrow(/g_s: 9, log_ratio: 1/);
    expect(() => runSynthesis([], request())).toThrow(NoEffectsError);
  });

  it('runs subgroups with Q-between, leave-one-out, cumulative by year, trim-and-fill and meta-regression', () => {
    const out = runSynthesis(effects, request({ subgroup: 'task', moderator: 'standardMs', method: 'REML', hksj: true }));
    expect(out.subgroups!.groups).toHaveLength(1);
    expect(out.subgroups!.Q_between).toBeNull();
    expect(out.leaveOneOut).toHaveLength(8);
    expect(out.cumulative!.map((c) => c.year)).toEqual([2011, 2013, 2014, 2016, 2018, 2019, 2020, 2022]);
    expect(out.cumulative!.at(-1)!.estimate).toBeCloseTo(out.result.estimate, 8);
    expect(out.trimFill).not.toBeNull();
    expect(out.metaRegression!.k).toBe(8);
    expect(out.figures.bubble).not.toBeNull();
    expect(out.cautions.map((c) => c.code)).toContain('few_studies_tests');
    expect(out.cautions.at(-1)!.code).toBe('not_clinical');

    const twoGroups = effects.map((e) => ({ ...e, modality: e.id % 2 ? 'visual' : 'auditory' }));
    const sg = runSynthesis(twoGroups, request({ subgroup: 'modality' }));
    expect(sg.subgroups!.groups.length).toBeGreaterThanOrEqual(2);
    expect(sg.subgroups!.Q_between).toBeGreaterThanOrEqual(0);
    expect(sg.subgroups!.df).toBe(sg.subgroups!.groups.length - 1);
  });

  it('warns under 5 studies unless HKSJ, and says why a small set cannot run every analysis', () => {
    const few = effects.slice(0, 3);
    const out = runSynthesis(few, request());
    expect(out.cautions.map((c) => c.code)).toContain('few_studies_dl');
    expect(runSynthesis(few, request({ hksj: true })).cautions.map((c) => c.code)).not.toContain('few_studies_dl');
    const single = runSynthesis(effects.slice(0, 1), request());
    expect(single.counts.studies).toBe(1);
    expect(single.unavailable.map((u) => u.analysis)).toContain('trim-and-fill');
  });

  it('writes a methods paragraph naming the estimator, dependence rule, software and PRISMA counts', () => {
    const out = runSynthesis(effects, request({ method: 'PM', dependence: { mode: 'aggregate', r: 0.7 } }));
    const text = methodsParagraph({
      request: out.request, metricLabel: "Hedges' g", counts: out.counts, software: { name: 'Chronometa', version: '0.1.0' }, registryVersion: 12,
      prisma: { identified: 40, duplicatesRemoved: 2, screened: 33, excluded: 5, included: 28, notYetScreened: 5, coded: 20, settled: 15 },
    });
    expect(text).toMatch(/5 excluded, 5 not yet screened, 28 included in the registry, 20 coded and 15 with settled effects; of these/);
    expect(text).toMatch(/Paule–Mandel method \(Paule & Mandel, 1982\)/);
    expect(text).toMatch(/r = 0\.70/);
    expect(text).toMatch(/Chronometa 0\.1\.0 on registry version 12/);
    expect(text).toMatch(/40 records identified.*2 duplicates removed.*33 records screened.*5 excluded.*28 included/);
    expect(text).toMatch(/8 references \(8 studies, 9 effects\)/);
    expect(text).toMatch(/Egger's regression test .*, Begg's rank correlation .* and trim-and-fill/);
    const fewer = methodsParagraph({
      request: out.request, metricLabel: "Hedges' g", counts: { effects: 2, studies: 2, references: 2 }, software: { name: 'Chronometa', version: '0.1.0' }, registryVersion: 1, prisma: null,
      notRun: ["Begg's test", 'trim-and-fill'],
    });
    expect(fewer).not.toMatch(/Begg|trim-and-fill|Egger/);
    expect(fewer).toMatch(/Leave-one-out and cumulative \(by year\) analyses/);
  });
});

describe('forest plot builder', () => {
  it('draws squares sized by weight, arrows for CIs past the axis, the diamond and the prediction interval', () => {
    const studies = Array.from({ length: 150 }, (_, i) => ({ label: `Invented lab ${i}`, year: 2000 + (i % 20), n: 20, effect: i === 7 ? 9 : 0.2 + (i % 5) * 0.05, variance: i === 7 ? 0.01 : 0.04, weight: 100 / 150 }));
    const fig = forestFigure({ metric: 'g_s', metricLabel: "Hedges' g", level: 0.95, studies, pooled: { label: 'Pooled', estimate: 0.3, ci_lower: 0.25, ci_upper: 0.35, pi_lower: 0.1, pi_upper: 0.5 } });
    const byMeta = (m: string) => fig.data.filter((d) => d.meta === m);
    expect((byMeta('studies')[0].x as number[]).length).toBe(150);
    const right = byMeta('arrows')[1].x as number[];
    expect(right).toHaveLength(1);
    expect(byMeta('pooled')).toHaveLength(1);
    expect(byMeta('prediction')).toHaveLength(1);
    expect((fig.layout.height as number) / 150).toBeGreaterThanOrEqual(15);
    const shapes = fig.layout.shapes as Array<{ x0: number }>;
    expect(shapes.some((s) => s.x0 === 0)).toBe(true);
  });
});
