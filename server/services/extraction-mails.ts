// The mails of the double-coding workflow: a coder is asked to code, curators hear of a dispute, coders of a settlement.
import type { Discrepancy } from './comparison.js';
import type { OutgoingMail } from './mail.js';
import { refLabel } from '../repositories/db.js';
import type { Contact } from '../repositories/users.js';

interface RefInfo {
  title: string;
  first_author: string | null;
  year: number | null;
}

/** `claim` is the state of the coder's own earlier claim that the pair adopted, if any. */
export function assignmentMail(appOrigin: string, coder: Contact, ref: RefInfo, extractionId: number, claim: 'draft' | 'submitted' | null = null): OutgoingMail {
  const yours =
    claim === 'submitted'
      ? 'Your submitted sheet joins the pair as it is; it is compared with the second coding as soon as both are in.'
      : claim === 'draft'
        ? 'Your draft joins the pair with everything you entered.'
        : 'A second coder codes it independently; you will not see each other\'s sheet until it is settled.';
  return {
    kind: 'assignment',
    to: coder.email ?? '',
    subject: `Chronometa: please code ${refLabel(ref)}`,
    body: `Hello ${coder.login},\n\nYou have been paired with a second coder on "${ref.title}" (${refLabel(ref)}) for the registry. ${yours} Coding is blind: neither of you sees the other's sheet until it is settled.\n\nOpen your sheet: ${appOrigin}/extractions/${extractionId}\n`,
  };
}

export function disputedMail(appOrigin: string, to: string, ref: RefInfo, assignmentId: number, found: Pick<Discrepancy, 'label'>[]): OutgoingMail {
  const n = found.length;
  return {
    kind: 'disputed',
    to,
    subject: `Chronometa: ${refLabel(ref)} needs reconciliation (${n} discrepanc${n === 1 ? 'y' : 'ies'})`,
    body: `The two codings of "${ref.title}" (${refLabel(ref)}) disagree on ${n} field${n === 1 ? '' : 's'}:\n\n${found.map((d) => `- ${d.label}`).join('\n')}\n\nReconcile them: ${appOrigin}/reconciliation/${assignmentId}\n`,
  };
}

/** `how` says how the record came to be settled. */
export function settledMail(appOrigin: string, coder: Contact, ref: RefInfo, recordId: number, how: string): OutgoingMail {
  return {
    kind: 'settled',
    to: coder.email ?? '',
    subject: `Chronometa: your coding of ${refLabel(ref)} is settled`,
    body: `Hello ${coder.login},\n\nThe record of "${ref.title}" (${refLabel(ref)}) is settled. ${how}\n\nSee the settled record: ${appOrigin}/records/${recordId}\n`,
  };
}
