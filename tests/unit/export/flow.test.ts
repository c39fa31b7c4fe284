import { describe, expect, it } from 'vitest';
import { enteringCounts, filterAttribution, synthesisFlow, type SynthesisFlowCounts } from '../../../shared/synthesis/flow.js';
import { prismaFlowSvg, wrap } from '../../../shared/plots/prisma-flow.js';
import { methodsParagraph } from '../../../shared/synthesis/methods.js';
import { synthesisRequestSchema } from '../../../shared/schemas/synthesis.js';
import { filterSettledEffects } from '../../../server/services/settled-effects-cache.js';
import type { SettledEffect } from '../../../shared/synthesis/types.js';

const counts: SynthesisFlowCounts = {
  identified: { total: 1040, bySource: { bibtex: 900, doi: 140 } },
  duplicatesRemoved: { total: 40, importDuplicates: 30, merged: 10 },
  // 1,000 after duplicates: 874 not yet screened, 126 decided on title and abstract (30 excluded, 96 passed);
  // of those 96, 8 await the full text and 88 were decided on it (22 excluded, 66 included)
  screeningStages: {
    title_abstract: { decided: 126, waiting: 874, included: 96, excluded: 30, excludedByReason: { not_time_perception: 25, no_reason_given: 5, other: 0 } },
    full_text: { decided: 88, waiting: 8, included: 66, excluded: 22, excludedByReason: { no_usable_statistics: 14, wrong_population: 8 } },
  },
  reasonLabels: { wrong_population: 'Wrong population', not_time_perception: 'Not about time perception', no_usable_statistics: 'No usable statistics', no_reason_given: 'No reason given' },
  coded: 50,
  settled: 31,
  outsideByStep: { manipulation: 18, outcome: 0, metric: 4 },
  entering: { references: 9, studies: 11, effects: 17 },
};

let nextId = 1;
const effect = (referenceId: number, studyId: number, over: Partial<SettledEffect> = {}): SettledEffect => ({
  id: nextId++, referenceId, studyId, studyLabel: 'Experiment 1', referenceLabel: `Author ${referenceId}`, year: 2010 + referenceId, outcome: 'duration_distortion',
  manipulation: 'luminance', metric: 'g_s', effect: 0.3, variance: 0.05, n: 20, design: 'between', population: 'healthy_adults', modality: 'visual', task: 'reproduction',
  standardMs: 600, ...over,
});

describe('synthesis flow (PRISMA 2020, per stage)', () => {
  it('chains the stages: each starts with what the one before passed on, and excluded + pending + passed = entered', () => {
    const f = synthesisFlow(counts);
    expect(f.afterDuplicates).toBe(1000);
    expect(f.stages.map((s) => [s.stage, s.entered, s.passed, s.excluded, s.pending])).toEqual([
      ['title_abstract', 1000, 96, 30, 874],
      ['full_text', 96, 66, 22, 8],
      ['coding', 66, 50, 0, 16],
      ['reconciliation', 50, 31, 0, 19],
      ['synthesis', 31, 9, 22, 0],
    ]);
    for (const s of f.stages) expect(s.passed + s.excluded + s.pending).toBe(s.entered);
    for (let i = 1; i < f.stages.length; i++) expect(f.stages[i].entered).toBe(f.stages[i - 1].passed);
    expect(f.stages[0].entered).toBe(f.afterDuplicates);
    // reasons: largest first, zero counts left out, labels in words
    expect(f.stages[0].excludedByReason).toEqual([
      { reason: 'not_time_perception', label: 'Not about time perception', count: 25 },
      { reason: 'no_reason_given', label: 'No reason given', count: 5 },
    ]);
    expect(f.stages[1].excludedByReason).toEqual([
      { reason: 'no_usable_statistics', label: 'No usable statistics', count: 14 },
      { reason: 'wrong_population', label: 'Wrong population', count: 8 },
    ]);
    expect(f.stages[1].pendingLabel).toBe('awaiting full-text screening');
    expect(f.stages[4].excludedByReason).toEqual([
      { reason: 'manipulation', label: 'Another manipulation', count: 18 },
      { reason: 'metric', label: 'Another metric', count: 4 },
    ]);
    expect(f.stages[0].pendingLabel).toBe('not yet screened');
  });

  it('refuses a count that is not a whole number ≥ 0', () => {
    expect(() => synthesisFlow({ ...counts, coded: -1 })).toThrow(/coded/);
    const ft = counts.screeningStages.full_text;
    expect(() => synthesisFlow({ ...counts, screeningStages: { ...counts.screeningStages, full_text: { ...ft, waiting: -1 } } })).toThrow(/full_text.waiting/);
  });

  it('refuses screening stages that disagree: what passed title and abstract is what reached the full text', () => {
    const ft = counts.screeningStages.full_text;
    expect(() => synthesisFlow({ ...counts, screeningStages: { ...counts.screeningStages, full_text: { ...ft, waiting: 9 } } })).toThrow(/96 passed title and abstract but 97 reached full text/);
    expect(() => synthesisFlow({ ...counts, entering: { ...counts.entering, effects: 1.5 } })).toThrow(/effects/);
  });

  it('counts each reference outside the filters once, under the first filter that leaves it no effect', () => {
    const all = [
      effect(1, 11), // enters
      effect(1, 12, { metric: 'log_ratio' }),
      effect(2, 21, { manipulation: 'size' }), // manipulation
      effect(3, 31, { outcome: 'temporal_order', metric: 'log_ratio' }), // outcome (then metric too: counted once)
      effect(4, 41, { metric: 'log_ratio' }), // metric
      effect(5, 51, { year: 1990 }), // years
      effect(6, 61), // enters
      effect(6, 62), // enters, second study
    ];
    const filters = { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s', yearFrom: 2000 };
    expect(filterAttribution(all, filters, filterSettledEffects)).toEqual({ manipulation: 1, outcome: 1, metric: 1, years: 1 });
    expect(enteringCounts(filterSettledEffects(all, filters))).toEqual({ references: 2, studies: 3, effects: 3 });
    // a filter the synthesis does not set is not a step
    expect(filterAttribution(all, { outcome: 'duration_distortion' }, filterSettledEffects)).toEqual({ outcome: 1 });
    expect(filterAttribution(all, {}, filterSettledEffects)).toEqual({});
    // parameter and unit are steps of their own
    const measured = [effect(7, 71, { parameter: 'pse', unit: 'ms' }), effect(8, 81, { parameter: 'duration_ratio', unit: 'ratio' })];
    expect(filterAttribution(measured, { parameter: 'pse', unit: 'ms' }, filterSettledEffects)).toEqual({ parameter: 1, unit: 0 });
  });
});

describe('PRISMA 2020 flow diagram (SVG)', () => {
  const svg = prismaFlowSvg(synthesisFlow(counts), { title: 'Luminance <bright> & duration' });

  it('is one SVG document with every count of the flow in words', () => {
    expect(svg.startsWith('<?xml')).toBe(true);
    expect(svg.match(/<svg /g)).toHaveLength(1);
    expect(svg.trim().endsWith('</svg>')).toBe(true);
    const text = [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]).join('\n');
    for (const line of [
      'Records identified in the registry (n = 1,040)',
      'BibTeX import: 900',
      'DOI look-up: 140',
      'Records removed before screening (n = 40)',
      'Duplicate entries at import: 30',
      'Duplicate references merged: 10',
      'Records screened on title and abstract (n = 1,000)',
      'Records excluded (n = 30)',
      'Not about time perception: 25',
      'No reason given: 5',
      'Not yet screened (n = 874)',
      'Reports assessed in full text (n = 96)',
      'Reports excluded (n = 22)',
      'No usable statistics: 14',
      'Wrong population: 8',
      'Awaiting full-text screening (n = 8)',
      'Reports included for coding (n = 66)',
      'Not yet coded (n = 16)',
      'Reports coded twice and compared (n = 50)',
      'Not yet settled (n = 19)',
      'References with settled effects (n = 31)',
      'Another manipulation: 18',
      'Another metric: 4',
      'Entering this synthesis (n = 9 references)',
      '11 studies, 17 effects',
      'Identification',
      'Screening',
      'Included',
    ])
      expect(text).toContain(line);
    expect(text).toMatch(/Outside this synthesis’s filters \(n = 22\)/);
  });

  it('draws a flow kept before the screening stages were split with its one screening box', () => {
    const f = synthesisFlow(counts);
    const [ta, ft, ...rest] = f.stages;
    const older = { ...f, stages: [{ ...ta, stage: 'screening' as const, passed: ft.passed, excluded: ta.excluded + ft.excluded, pending: ta.pending + ft.pending }, ...rest] };
    const text = [...prismaFlowSvg(older).matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]).join('\n');
    expect(text).toContain('Titles and abstracts screened (n = 1,000)');
    expect(text).toContain('Records excluded (n = 52)');
    expect(text).not.toContain('Reports assessed in full text');
    expect(text).toContain('Reports included for coding (n = 66)');
  });

  it('escapes text and names itself for screen readers', () => {
    expect(svg).toContain('Luminance &lt;bright&gt; &amp; duration');
    expect(svg).not.toContain('<bright>');
    expect(svg).toMatch(/<title>PRISMA 2020 flow diagram: Luminance &lt;bright&gt; &amp; duration<\/title>/);
  });

  it('keeps every box inside the drawing', () => {
    const [, w, h] = svg.match(/<svg [^>]*width="(\d+(?:\.\d+)?)" height="(\d+(?:\.\d+)?)"/)!.map(Number);
    for (const m of svg.matchAll(/<rect x="([\d.]+)" y="([\d.]+)" width="([\d.]+)" height="([\d.]+)"/g)) {
      const [x, y, rw, rh] = m.slice(1).map(Number);
      expect(x + rw).toBeLessThanOrEqual(w);
      expect(y + rh).toBeLessThanOrEqual(h);
    }
  });

  it('wraps long labels to the box', () => {
    const lines = wrap('a '.repeat(200), 200);
    expect(lines.length).toBeGreaterThan(5);
    for (const l of lines) expect(l.length).toBeLessThanOrEqual(Math.floor((200 - 16) / 6.1));
  });
});

describe('methods paragraph: study flow per screening stage', () => {
  const base = {
    request: synthesisRequestSchema.parse({ filters: { manipulation: 'luminance' } }),
    metricLabel: "Hedges' g",
    counts: { effects: 17, studies: 11, references: 9 },
    software: { name: 'Chronometa', version: '0.1.0' },
    registryVersion: 3,
  };
  const prisma = { identified: 1040, duplicatesRemoved: 40, screened: 118, excluded: 52, included: 66, notYetScreened: 882, coded: 50, settled: 31 };

  it('says each stage with its own exclusions by reason and what still waits', () => {
    const text = methodsParagraph({
      ...base,
      prisma: {
        ...prisma,
        stages: {
          titleAbstract: { decided: 126, excluded: 30, excludedReasons: [{ reason: 'Not about time perception', count: 25 }, { reason: 'no reason given', count: 5 }], waiting: 874 },
          fullText: { decided: 88, excluded: 22, excludedReasons: [{ reason: 'No usable statistics', count: 14 }, { reason: 'Wrong population', count: 8 }], waiting: 8 },
        },
      },
    });
    expect(text).toContain(
      '1040 records identified in the registry, 40 duplicates removed, 126 records screened on title and abstract, 30 excluded (Not about time perception: 25; no reason given: 5), 874 not yet screened; ' +
        '88 reports assessed in full text, 22 excluded (No usable statistics: 14; Wrong population: 8), 8 awaiting full-text screening; 66 included in the registry, 50 coded and 31 with settled effects; of these, 9 references',
    );
  });

  it('keeps the one screening sentence for counts saved before the split', () => {
    const text = methodsParagraph({ ...base, prisma });
    expect(text).toContain('40 duplicates removed, 118 records screened, 52 excluded, 882 not yet screened, 66 included in the registry');
    expect(text).not.toContain('full text');
  });
});
