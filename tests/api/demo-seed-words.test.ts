import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import * as people from '../../seeds/01_demo_people.js';
import * as references from '../../seeds/02_demo_references.js';
import * as registry from '../../seeds/03_demo_registry.js';
import * as snapshots from '../../seeds/04_demo_snapshots.js';
import * as mail from '../../seeds/05_demo_mail.js';
import * as trialData from '../../seeds/06_demo_trial_data.js';
import { querySettledEffects } from '../../server/repositories/effects.js';
import { FAKE_IDENTITIES } from '../../server/fakes/identities.js';
import { createTestApp, resetDb, type TestApp } from '../support/test-app.js';

/** Words that mark test, bench or placeholder data; none belongs in the demo `npm start` shows. */
const TEST_LOOKING = /\b(test(ing)?|probe|check|fixture|dummy|placeholder|foo|baz|foobar|lorem|ipsum|asdf|xxx|todo|synthetic|bench(mark)?|e2e|untitled|paper \d+|reference \d+|waiting paper|included paper|off-topic)\b/i;
const INVENTED_JOURNAL = /\b(Invented|Imaginary|Fictional|Made-up)\b/;

interface RefRow {
  id: number;
  title: string | null;
  doi: string | null;
  year: number | null;
  first_author: string | null;
  csl: { 'container-title'?: string; author?: Array<{ family?: string; given?: string }> } | null;
}

const SEEDS = [people, references, registry, snapshots, mail, trialData];
const SEED_FILES = ['01_demo_people.ts', '02_demo_references.ts', '03_demo_registry.ts', '04_demo_snapshots.ts', '05_demo_mail.ts', '06_demo_trial_data.ts'];

describe('the shipped demo data: invented, consistent, and free of test data', () => {
  let t: TestApp;
  let refs: RefRow[];
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    // every seed file in order, as `npm start` runs them
    for (const s of SEEDS) await s.seed(t.ctx.db);
    refs = await t.ctx.db('refs').select('id', 'title', 'doi', 'year', 'first_author', 'csl');
  }, 120_000);
  afterAll(() => t.close());

  it('seeds a registry at all (so the checks below have something to check), from every seed file there is', () => {
    expect(readdirSync(new URL('../../seeds', import.meta.url)).filter((f) => f.endsWith('.ts')).sort()).toEqual(SEED_FILES);
    expect(refs.length).toBeGreaterThanOrEqual(50);
  });

  it('has no test-looking titles, and no title a test or benchmark helper uses', () => {
    const looking = refs.filter((r) => !r.title || TEST_LOOKING.test(r.title)).map((r) => r.title);
    expect(looking).toEqual([]);
    // the test helpers' and benchmarks' own titles never reach the demo
    for (const helperTitle of ['Looming discs feel longer', 'Filled intervals in auditory bisection', 'Audiovisual simultaneity in older adults', 'SYNTHETIC benchmark reference'])
      expect(refs.filter((r) => r.title!.startsWith(helperTitle))).toEqual([]);
  });

  it('gives every DOI under the invented prefix 10.5555, as a demo DOI, and every journal an invented name', () => {
    const dois = refs.map((r) => r.doi).filter((d): d is string => d !== null);
    expect(dois.length).toBeGreaterThanOrEqual(40);
    for (const d of dois) expect(d).toMatch(/^10\.5555\/(chrono\.)?demo\./);
    const journals = refs.map((r) => r.csl?.['container-title']).filter((j): j is string => !!j);
    expect(journals.length).toBeGreaterThanOrEqual(40);
    for (const j of journals) expect(j).toMatch(INVENTED_JOURNAL);
  });

  it('keeps each paper’s authors consistent: the listed first author is the first in its citation, and settled records are labelled by them and the year', async () => {
    for (const r of refs.filter((x) => x.csl?.author?.length)) expect(r.first_author).toBe(r.csl!.author![0].family);
    const byId = new Map(refs.map((r) => [r.id, r]));
    const effects = await querySettledEffects(t.ctx.db);
    expect(effects.length).toBeGreaterThan(100);
    for (const e of effects) {
      const r = byId.get(e.referenceId)!;
      expect(e.referenceLabel).toContain(r.first_author!);
      expect(e.year).toBe(r.year);
    }
  });

  it('keeps the invented people and labs consistent: each address is on the reserved .example domain of the person’s own lab, and mail goes to a person of the demo', async () => {
    for (const who of FAKE_IDENTITIES) {
      expect(who.email).toMatch(/\.example$/);
      const domain = who.email.split('@')[1].replace(/\.example$/, '');
      const [first, last] = who.name.toLowerCase().split(' ');
      expect(who.email.split('@')[0]).toContain(first.split('-')[0]);
      expect(last).toBeTruthy();
      // tempora-lab ↔ "Tempora Lab", interval-group ↔ "Interval Group", student ↔ "… student …"
      const words = domain.split('-');
      for (const w of words) expect(who.lab.toLowerCase()).toContain(w);
    }
    const users = await t.ctx.db('users').select('email');
    const emails = new Set(users.map((u: { email: string }) => u.email));
    const mails = await t.ctx.db('mail_log').select('to_address');
    expect(mails.length).toBeGreaterThanOrEqual(1);
    for (const m of mails) expect(emails).toContain(m.to_address);
  });

  it('names the demo snapshot after what it pools', async () => {
    const snapshots = await t.ctx.db('snapshots').select('title', 'request');
    expect(snapshots.length).toBe(1);
    const [s] = snapshots;
    expect(s.title).toMatch(/luminance/i);
    expect(s.request.filters.manipulation).toBe('luminance');
    expect(TEST_LOOKING.test(s.title)).toBe(false);
  });
});
