import { describe, expect, it } from 'vitest';
import { enteringCounts, filterAttribution, synthesisFlow, type SynthesisFlowCounts } from '../../../shared/synthesis/flow.js';
import { prismaFlowSvg, wrap } from '../../../shared/plots/prisma-flow.js';
import { filterSettledEffects } from '../../../server/services/settled-effects-cache.js';
import type { SettledEffect } from '../../../shared/synthesis/types.js';

const counts: SynthesisFlowCounts = {
  identified: { total: 1040, bySource: { bibtex: 900, doi: 140 } },
  duplicatesRemoved: { total: 40, importDuplicates: 30, merged: 10 },
  screened: 126,
  notYetScreened: 874,
  excludedByReason: { wrong_population: 20, not_time_perception: 40, other: 0 },
  reasonLabels: { wrong_population: 'Wrong population', not_time_perception: 'Not about time perception' },
  included: 66,
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
      ['screening', 1000, 66, 60, 874],
      ['coding', 66, 50, 0, 16],
      ['reconciliation', 50, 31, 0, 19],
      ['synthesis', 31, 9, 22, 0],
    ]);
    for (const s of f.stages) expect(s.passed + s.excluded + s.pending).toBe(s.entered);
    for (let i = 1; i < f.stages.length; i++) expect(f.stages[i].entered).toBe(f.stages[i - 1].passed);
    expect(f.stages[0].entered).toBe(f.afterDuplicates);
    // reasons: largest first, zero counts left out, labels in words
    expect(f.stages[0].excludedByReason).toEqual([
      { reason: 'not_time_perception', label: 'Not about time perception', count: 40 },
      { reason: 'wrong_population', label: 'Wrong population', count: 20 },
    ]);
    expect(f.stages[3].excludedByReason).toEqual([
      { reason: 'manipulation', label: 'Another manipulation', count: 18 },
      { reason: 'metric', label: 'Another metric', count: 4 },
    ]);
    expect(f.stages[0].pendingLabel).toBe('not yet screened');
  });

  it('refuses a count that is not a whole number ≥ 0', () => {
    expect(() => synthesisFlow({ ...counts, coded: -1 })).toThrow(/coded/);
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
      'Titles and abstracts screened (n = 1,000)',
      'Records excluded (n = 60)',
      'Not about time perception: 40',
      'Wrong population: 20',
      'Not yet screened (n = 874)',
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
