import { describeAccess } from '../support/access.js';
import { insertReference } from './extraction-fixtures.js';

// Row-level refusals (a curator who screened the record settling it, a screener undoing a settled pair) are in screening-dual.test.ts.
describeAccess(
  'two-screener rule and disagreement routes',
  [
    { method: 'get', path: '/api/screening/rule', who: ['contributor'] },
    { method: 'get', path: '/api/screening/agreement', who: 'anyone' },
    { method: 'put', path: '/api/screening/rule', body: { screeners: 1 }, who: ['curator'], bad: { body: { screeners: 'two' } } },
    { method: 'get', path: '/api/screening/conflicts?stage=full_text', who: ['curator'], bad: { path: '/api/screening/conflicts?stage=abstract' } },
    {
      method: 'post', path: (ids) => `/api/screening/conflicts/${ids.ref}/settle`, body: { stage: 'title_abstract', decision: 'included', rationale: 'Fits the question.', version: 1 }, who: ['curator'],
      bad: { path: '/api/screening/conflicts/x/settle', body: { stage: 'title_abstract', decision: 'maybe', rationale: '', version: 0 } },
    },
  ],
  async (t) => ({ ref: await insertReference(t.ctx.db) }),
);
