import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { cohensKappa, cohensKappaFromPairs } from '../../shared/agreement/cohens-kappa.js';
import { icc } from '../../shared/agreement/icc.js';

// Debian's python (not the one on PATH) carries statsmodels (apt-get install python3-statsmodels).
const PYTHON = '/usr/bin/python3';

function statsmodelsKappa(tables: number[][][]): { kappa: number; std_kappa: number; std_kappa0: number }[] {
  const script = `
import json, sys
from statsmodels.stats.inter_rater import cohens_kappa
out = []
for t in json.loads(sys.stdin.read()):
    r = cohens_kappa(t)
    out.append({"kappa": float(r.kappa), "std_kappa": float(r.std_kappa), "std_kappa0": float(r.std_kappa0)})
print(json.dumps(out))
`;
  // Throws (and so fails the test) when statsmodels is missing: the check must not be skipped.
  return JSON.parse(execFileSync(PYTHON, ['-c', script], { input: JSON.stringify(tables), encoding: 'utf8' }));
}

describe("Cohen's kappa", () => {
  const tables = [
    [[75, 1, 4], [5, 4, 1], [0, 0, 10]],
    [[20, 5], [10, 15]],
    [[12, 3, 0, 1], [2, 18, 4, 0], [0, 3, 9, 2], [1, 0, 2, 7]],
    [[40, 0], [0, 3]],
    [[5, 9], [8, 2]],
  ];

  it('matches statsmodels.stats.inter_rater.cohens_kappa (kappa and both standard errors)', () => {
    const ref = statsmodelsKappa(tables);
    tables.forEach((t, i) => {
      const ours = cohensKappa(t);
      expect(ours.kappa).toBeCloseTo(ref[i].kappa, 12);
      expect(ours.se).toBeCloseTo(ref[i].std_kappa, 12);
      expect(ours.se0).toBeCloseTo(ref[i].std_kappa0, 12);
    });
  });

  it('reproduces a published worked example', () => {
    // Fleiss, Levin & Paik (2003), Statistical Methods for Rates and Proportions, 3rd ed., ch. 18: two
    // raters assign 100 patients to psychotic / neurotic / organic; p_o = 0.89, p_e = 0.66, κ = 0.68.
    // Cell counts and the printed values are quoted from memory of that example.
    const r = cohensKappa([[75, 1, 4], [5, 4, 1], [0, 0, 10]]);
    expect(r.percentAgreement).toBeCloseTo(0.89, 12);
    expect(r.expectedAgreement).toBeCloseTo(0.66, 12);
    expect(r.kappa!.toFixed(2)).toBe('0.68');
  });

  it('builds the table from paired labels and handles degenerate input', () => {
    const pairs: [string, string][] = [['a', 'a'], ['a', 'b'], ['b', 'b'], ['b', 'b'], ['a', 'a']];
    const r = cohensKappaFromPairs(pairs);
    expect(r.categories).toEqual(['a', 'b']);
    expect(r.kappa).toBeCloseTo(cohensKappa([[2, 1], [0, 2]]).kappa!, 14);
    // One category used by both throughout: agreement is perfect but kappa is undefined.
    expect(cohensKappa([[7]]).kappa).toBeNull();
    expect(cohensKappa([[7]]).percentAgreement).toBe(1);
    expect(() => cohensKappa([[1, 2]])).toThrow(/square/);
    expect(() => cohensKappa([[0, 0], [0, 0]])).toThrow(/at least one/);
  });
});

describe('intraclass correlation', () => {
  // Shrout & Fleiss (1979), Psychological Bulletin 86, 420–428, Table 2: 6 targets × 4 judges, and their
  // Table 4 values (two decimals). Quoted from memory of the paper; the mean squares follow from the data.
  const ratings = [
    [9, 2, 5, 8],
    [6, 1, 3, 2],
    [8, 4, 6, 8],
    [7, 1, 2, 6],
    [10, 5, 6, 9],
    [6, 2, 4, 7],
  ];

  it('reproduces the Shrout & Fleiss worked example', () => {
    const r = icc(ratings);
    expect(r.icc1_1!.toFixed(2)).toBe('0.17');
    expect(r.icc2_1!.toFixed(2)).toBe('0.29');
    expect(r.icc3_1!.toFixed(2)).toBe('0.71');
    expect(r.icc1_k!.toFixed(2)).toBe('0.44');
    expect(r.icc2_k!.toFixed(2)).toBe('0.62');
    expect(r.icc3_k!.toFixed(2)).toBe('0.91');
    // Mean squares of their ANOVA table: BMS 11.24, WMS 6.26, JMS 32.49, EMS 1.02.
    expect(r.bms).toBeCloseTo(11.2417, 3);
    expect(r.wms).toBeCloseTo(6.2639, 3);
    expect(r.jms).toBeCloseTo(32.4861, 3);
    expect(r.ems).toBeCloseTo(1.0194, 3);
  });

  it('is 1 for identical coders and refuses ragged input', () => {
    const r = icc([[0.2, 0.2], [0.5, 0.5], [0.9, 0.9]]);
    expect(r.icc2_1).toBeCloseTo(1, 14);
    expect(() => icc([[1, 2], [3]])).toThrow();
    expect(() => icc([[1, 2]])).toThrow(/at least 2/);
  });
});
