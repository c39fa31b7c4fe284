// aggregateWithinStudy() against R metafor's aggregate.escalc(struct = "CS", rho = r) with weighted = TRUE (the
// inverse-variance composite) and weighted = FALSE (the plain mean, Borenstein et al. 2009, ch. 24), on
// metafor's dat.assink2016 (Assink & Wibbelink 2016; effects within studies) and a seeded invented sheet with
// singletons, at r = 0, .2, .4, .6, .8, .9. Tolerance 1e-12 relative (closed form).
import { describe, expect, it } from 'vitest';
import { aggregateWithinStudy } from '../../shared/stats/index.js';
import { rVector, runRSource } from './r-reference.js';
import { relErr } from './python-reference.js';
import { gaussian, mulberry32 } from '../support/random.js';

const RS = [0, 0.2, 0.4, 0.6, 0.8, 0.9];

function inventedSheet() {
  const rnd = mulberry32(1414);
  const z = gaussian(rnd);
  const yi: number[] = [];
  const vi: number[] = [];
  const study: number[] = [];
  [1, 4, 2, 1, 6, 3, 1, 2].forEach((m, j) => {
    for (let i = 0; i < m; i++) {
      vi.push(0.01 + 0.2 * rnd());
      yi.push(0.3 + 0.4 * z());
      study.push(j + 1);
    }
  });
  return { yi, vi, study };
}

interface Side { yi: number[]; vi: number[]; study: number[] }
interface Out { data: Side; fits: Record<string, Record<'w' | 'u', { yi: number[]; vi: number[] }>> }

function reference(name: string, data: Side | null): Out {
  const load = data
    ? `dat <- data.frame(yi = ${rVector(data.yi)}, vi = ${rVector(data.vi)}, study = ${rVector(data.study)})`
    : 'dat <- dat.assink2016[, c("yi", "vi", "study")]';
  return runRSource<Out>(`
${load}
dat <- escalc(measure = "GEN", yi = yi, vi = vi, data = dat)
fits <- list()
for (r in c(${RS.join(', ')})) {
  w <- aggregate(dat, cluster = study, struct = "CS", rho = r, weighted = TRUE)
  u <- aggregate(dat, cluster = study, struct = "CS", rho = r, weighted = FALSE)
  fits[[sprintf("%.1f", r)]] <- list(w = list(yi = I(as.numeric(w$yi)), vi = I(as.numeric(w$vi))), u = list(yi = I(as.numeric(u$yi)), vi = I(as.numeric(u$vi))))
}
cat(to_json(list(name = "${name}", data = list(yi = I(as.numeric(dat$yi)), vi = I(as.numeric(dat$vi)), study = I(as.numeric(dat$study))), fits = fits)))
`);
}

describe('aggregateWithinStudy against metafor aggregate.escalc (struct = "CS")', () => {
  for (const [name, data] of [['Assink & Wibbelink 2016', null], ['invented sheet with singletons', inventedSheet()]] as const) {
    it(`${name}: weighted and unweighted composites at r = ${RS.join(', ')} within 1e-12`, () => {
      const ref = reference(name, data);
      const d = ref.data;
      for (const r of RS) {
        for (const weighted of [true, false]) {
          const ours = aggregateWithinStudy({ effects: d.yi, variances: d.vi, studies: d.study, r, weighted });
          const theirs = ref.fits[r.toFixed(1)][weighted ? 'w' : 'u'];
          expect(ours.effects.length).toBe(theirs.yi.length);
          const worst = Math.max(
            ...ours.effects.map((y, j) => relErr(y, theirs.yi[j], Math.sqrt(theirs.vi[j]))),
            ...ours.variances.map((v, j) => relErr(v, theirs.vi[j], 0)),
          );
          expect(worst, `r = ${r}, weighted = ${weighted}`).toBeLessThan(1e-12);
        }
      }
    });
  }

  it('refuses the weighted composite at r = 1 with a message', () => {
    expect(() => aggregateWithinStudy({ effects: [0.1, 0.2], variances: [0.1, 0.2], studies: [1, 1], r: 1, weighted: true })).toThrow(/needs r < 1/);
  });
});
