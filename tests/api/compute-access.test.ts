import { describeAccess } from '../support/access.js';

describeAccess('stateless compute routes', [
  {
    method: 'post',
    path: '/api/compute/pool',
    body: { effects: [0.1, 0.3, 0.5], variances: [0.04, 0.05, 0.06], method: 'DL' },
    who: 'anyone',
    bad: { body: { effects: [0.1, 0.2], variances: [0.04, -1] } },
  },
  {
    method: 'post',
    path: '/api/compute/effect',
    body: { measure: 'fisher_z', r: 0.3, n: 40 },
    who: 'anyone',
    bad: { body: { measure: 'fisher_z', r: 1.7, n: 2 } },
  },
]);
