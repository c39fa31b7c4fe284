import { describeAccess } from '../support/access.js';

describeAccess('mail resend', [
  { method: 'post', path: '/api/mail/999999/resend', who: ['admin'], bad: { path: '/api/mail/abc/resend' } },
]);
