import { describeAccess } from '../support/access.js';
import { createSnapshot } from '../../server/services/snapshots.js';
import { synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import { settleInventedReference } from './syntheses-fixtures.js';

const body = { filters: { manipulation: 'luminance', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };
const multilevel = { ...body, dependence: { mode: 'multilevel', robust: true } };

describeAccess(
  'synthesis, snapshot and atlas routes',
  [
    { method: 'post', path: '/api/syntheses', body, who: 'anyone', bad: { body: { method: 'median', dependence: { mode: 'aggregate', r: 3 } } } },
    { method: 'post', path: '/api/syntheses', body: multilevel, who: 'anyone', bad: { body: { ...multilevel, dependence: { mode: 'multilevel', robust: 'yes' } } } },
    { method: 'post', path: '/api/syntheses', body: { ...body, moderators: ['year', 'standardMs'], subgroup: 'modality', subgroupTau2: 'pooled' }, who: 'anyone', bad: { body: { ...body, moderators: ['year', 'year'] } } },
    { method: 'get', path: '/api/syntheses/facets', who: 'anyone' },
    { method: 'post', path: '/api/syntheses/flow', body, who: 'anyone', bad: { body: { filters: { colour: 'red' } } } },
    { method: 'get', path: `/api/syntheses/export/flow.svg?request=${encodeURIComponent(JSON.stringify(body))}`, who: 'anyone', bad: { path: '/api/syntheses/export/flow.svg' } },
    { method: 'post', path: '/api/syntheses?rows=page&sort=weight&order=desc', body: multilevel, who: 'anyone', bad: { path: '/api/syntheses?rows=page&pageSize=500', body: multilevel } },
    { method: 'get', path: `/api/syntheses/export/studies.csv?request=${encodeURIComponent(JSON.stringify(body))}`, who: 'anyone', bad: { path: '/api/syntheses/export/studies.csv?request=%7B' } },
    { method: 'get', path: `/api/syntheses/export/synthesis.json?request=${encodeURIComponent(JSON.stringify(body))}`, who: 'anyone', bad: { path: '/api/syntheses/export/slides.pptx?request=%7B%7D' } },
    { method: 'get', path: '/api/snapshots', who: 'anyone', bad: { path: '/api/snapshots?sort=password&pageSize=0' } },
    { method: 'post', path: '/api/snapshots', body, who: ['reviewer'], bad: { body: { filters: { yearFrom: 'soon' } } } },
    { method: 'post', path: '/api/snapshots', body: multilevel, who: ['reviewer'], bad: { body: { ...body, dependence: { mode: 'aggregate', r: 1, weighted: true } } } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}`, who: 'anyone', bad: { path: '/api/snapshots/NOT_AN_ID!' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/export.csv`, who: 'anyone', bad: { path: '/api/snapshots/x/export.csv' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/effects.csv`, who: 'anyone', bad: { path: '/api/snapshots/0000000000000000/effects.csv' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/export.json`, who: 'anyone', bad: { path: '/api/snapshots/%20/export.json' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/citation`, who: 'anyone', bad: { path: '/api/snapshots/NOT-AN-ID/citation' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/references.bib`, who: 'anyone', bad: { path: '/api/snapshots/short/references.bib' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/flow.svg`, who: 'anyone', bad: { path: '/api/snapshots/NOT_AN_ID/flow.svg' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/methods.txt`, who: 'anyone', bad: { path: '/api/snapshots/0000000000000000/methods.txt' } },
    { method: 'get', path: '/api/atlas', who: 'anyone' },
    { method: 'get', path: '/api/atlas/manipulations/luminance', who: 'anyone', bad: { path: '/api/atlas/manipulations/no_such_term' } },
    { method: 'get', path: '/api/atlas/manipulations/luminance/pooled', who: 'anyone', bad: { path: '/api/atlas/manipulations/no_such_term/pooled' } },
    { method: 'get', path: '/api/atlas/manipulations/luminance/references', who: 'anyone', bad: { path: '/api/atlas/manipulations/luminance/references?sort=doi' } },
    { method: 'get', path: '/api/atlas/outcomes/duration_distortion', who: 'anyone', bad: { path: '/api/atlas/outcomes/happiness' } },
    { method: 'get', path: '/api/atlas/outcomes/duration_distortion/references', who: 'anyone', bad: { path: '/api/atlas/outcomes/duration_distortion/references?page=0' } },
  ],
  async (t) => {
    for (let i = 0; i < 3; i++) await settleInventedReference(t.ctx.db, 'luminance', 2010 + i, [{ mean1: 650 + i * 10, mean2: 600, sd: 90, n: 20 }]);
    const reviewer = await t.ctx.db('users').where({ login: 'reviewer' }).first('id');
    const snap = await createSnapshot(t.ctx.db, reviewer.id, synthesisRequestSchema.parse(body), undefined, process.env.APP_ORIGIN!);
    return { snapshot: snap.id };
  },
);
