// Shared by the benchmarks: SYNTHETIC bulk rows, percentiles, waiting for a spawned server.
import type { Knex } from 'knex';

/** SYNTHETIC settled records: `refs` references, `studiesPer` studies each, effects per study cycling through `effectsPer`. */
export async function bulkSynthetic(db: Knex, term: string, refs: number, studiesPer: number, effectsPer: number[], seed: number) {
  const existing = await db('manipulations').where({ term }).first('id');
  if (existing) {
    const [{ n }] = await db('effects').where({ manipulation_id: existing.id }).count<{ n: string }[]>({ n: '*' });
    return Number(n);
  }
  const [m] = await db('manipulations')
    .insert({ term, label: `SYNTHETIC ${term} (benchmark only)`, description: 'Synthetic rows made by tests/bench/synthesis.bench.ts; not research data.' })
    .returning('id');
  const cycle = `ARRAY[${effectsPer.join(',')}]`;
  // deterministic pseudo-random numbers from sin() so reruns are identical
  await db.raw(
    `
    WITH r AS (
      INSERT INTO refs (csl, doi, title, year, first_author, title_key, source, screening_status)
      SELECT jsonb_build_object('type','article-journal','title','SYNTHETIC benchmark reference ' || g, 'DOI', '10.5555/synthetic.${term}.' || g),
             '10.5555/synthetic.${term}.' || g, 'SYNTHETIC benchmark reference ' || g, 1990 + (g % 35), 'Synthetic' || (g % 97), 'synthetic ${term} ' || g, 'manual', 'included'
      FROM generate_series(1, ?) g RETURNING id
    ), x AS (
      INSERT INTO extractions (reference_id, kind, state, record_version, settled_at, submitted_at)
      SELECT id, 'settled', 'settled', 1, now(), now() FROM r RETURNING id, reference_id
    ), s AS (
      INSERT INTO studies (reference_id) SELECT x.reference_id FROM x, generate_series(1, ?) p RETURNING id, reference_id
    ), es AS (
      INSERT INTO extraction_studies (extraction_id, study_id, position, label, design, n1, n2, population, modality, task, standard_ms)
      SELECT x.id, s.id, row_number() OVER (PARTITION BY x.id ORDER BY s.id), 'Synthetic study', 'between', 20 + (s.id % 30), 20 + (s.id % 30),
             'healthy_adults', CASE WHEN s.id % 3 = 0 THEN 'auditory' ELSE 'visual' END, 'reproduction', 200 + (s.id % 40) * 50
      FROM s JOIN x ON x.reference_id = s.reference_id RETURNING id, extraction_id, study_id
    )
    INSERT INTO effects (extraction_id, extraction_study_id, position, label, outcome, manipulation_id, report_form, metric, effect, variance, formula, n_total)
    SELECT es.extraction_id, es.id, e, 'synthetic', 'duration_distortion', ?, 'smd', 'g_s',
           0.3 + 0.25 * sin(es.id * 12.9898 + e * 78.233 + ?), 0.02 + 0.15 * abs(sin(es.id * 3.1 + e + ?)), 'smd_independent', 40 + 2 * (es.id % 30)
    FROM es, generate_series(1, (${cycle})[1 + es.study_id % ${effectsPer.length}]) e
  `,
    [refs, studiesPer, m.id, seed, seed],
  );
  await db('registry_changes').insert({ kind: 'bench.synthetic', details: JSON.stringify({ term }) });
  const [{ n }] = await db('effects').where({ manipulation_id: m.id }).count<{ n: string }[]>({ n: '*' });
  return Number(n);
}

export function percentile(xs: number[], p: number) {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)];
}

export async function waitFor(u: string) {
  for (let i = 0; i < 120; i++) {
    try {
      if ((await fetch(u)).ok) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`server did not come up at ${u}`);
}
