import { describeAccess } from '../support/access.js';
import { createReference } from '../../server/services/references.js';

const BIB = '@article{acc1, title={Access test entry}, author={Acc, Ess}, year={2020}}';

describeAccess(
  'references, imports, screening, duplicates and search',
  [
    { method: 'post', path: '/api/imports', body: { format: 'bibtex', text: BIB }, who: ['contributor'], bad: { body: { format: 'endnote', text: '' } } },
    { method: 'get', path: '/api/imports', who: ['contributor'], bad: { path: '/api/imports?page=0' } },
    { method: 'get', path: (ids) => `/api/imports/${ids.batch}`, who: ['contributor'], bad: { path: '/api/imports/abc' } },
    { method: 'get', path: '/api/references', who: 'anyone', bad: { path: '/api/references?sort=password' } },
    { method: 'get', path: (ids) => `/api/references/${ids.a}`, who: 'anyone', bad: { path: '/api/references/-3' } },
    { method: 'get', path: (ids) => `/api/references/export?format=bibtex&ids=${ids.a}`, who: 'anyone', bad: { path: '/api/references/export?format=word&ids=1' } },
    { method: 'patch', path: (ids) => `/api/references/${ids.a}`, body: { version: 999, title: 'x' }, who: ['contributor'], bad: { body: { version: 'one' } } },
    { method: 'post', path: (ids) => `/api/references/${ids.a}/screening`, body: { decision: 'included', version: 1 }, who: ['contributor'], bad: { body: { decision: 'excluded', version: 1 } } },
    { method: 'post', path: (ids) => `/api/references/${ids.a}/attachments`, who: ['contributor'], bad: { body: { nothing: true } } },
    { method: 'get', path: (ids) => `/api/references/${ids.a}/attachments/999999`, who: ['contributor', 'reviewer'], bad: { path: (ids) => `/api/references/${ids.a}/attachments/zero` } },
    { method: 'post', path: '/api/references/merge', body: { a: 999998, b: 999999 }, who: ['curator'], bad: { body: { a: 'x' } } },
    { method: 'get', path: '/api/screening/queue', who: ['contributor'], bad: { path: '/api/screening/queue?limit=100000' } },
    { method: 'get', path: '/api/screening/counts', who: 'anyone' },
    { method: 'post', path: '/api/screening/decisions', body: { items: [{ refId: 999999, version: 1 }], decision: 'included' }, who: ['contributor'], bad: { body: { items: [], decision: 'included' } } },
    { method: 'post', path: '/api/screening/decisions/undo', body: { items: [{ refId: 999999, version: 1 }] }, who: ['contributor'], bad: { body: { items: 'all' } } },
    { method: 'post', path: (ids) => `/api/references/${ids.a}/screening/undo`, body: { version: 999 }, who: ['contributor'], bad: { body: { version: 'latest' } } },
    { method: 'get', path: '/api/duplicates', who: ['curator'], bad: { path: '/api/duplicates?status=sideways' } },
    { method: 'post', path: '/api/duplicates/999999/merge', body: {}, who: ['curator'], bad: { path: '/api/duplicates/abc/merge' } },
    { method: 'post', path: '/api/duplicates/999999/dismiss', body: {}, who: ['curator'], bad: { path: '/api/duplicates/0/dismiss' } },
    { method: 'get', path: '/api/search?q=access', who: 'anyone', bad: { path: '/api/search?limit=0' } },
  ],
  async (t) => {
    const a = await t.ctx.db.transaction((trx) => createReference(trx, { title: 'Access fixture', author: [{ family: 'Fixture' }], issued: { 'date-parts': [[2020]] } }, { source: 'seed' }));
    const [batch] = await t.ctx.db('import_batches').insert({ format: 'bibtex', total: 0, state: 'done' }).returning('id');
    return { a: a.id, batch: batch.id };
  },
);
