import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { followedRequestSummary } from '../../../shared/following/summary';
import { MAIL_STATUSES } from '../../../shared/schemas/admin';
import { EXTRACTION_STATES } from '../../../shared/schemas/extraction';
import { ASSIGNMENT_STATES } from '../../../shared/schemas/reconciliation';
import { auditDetailsText, auditRecordText } from '../../../shared/vocabulary/audit';
import { LABELS, labelOf } from '../../../shared/vocabulary/labels';
import { StateBadge } from '../../../src/components/ui/StateBadge';

const root = join(import.meta.dirname, '../../..');

/** Every audit action code and record kind the server writes (read from its source). */
function writtenAuditCodes() {
  const actions = new Set<string>();
  const records = new Set<string>();
  for (const f of readdirSync(join(root, 'server'), { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('.ts'))) {
    const src = readFileSync(join(root, 'server', f), 'utf8');
    if (!src.includes('recordAudit(')) continue;
    for (const m of src.matchAll(/action: (?:[^,]*\? )?'([a-z_.]+)'(?: : '([a-z_.]+)')?/g)) [m[1], m[2]].forEach((a) => a && actions.add(a));
    for (const m of src.matchAll(/entityType: '([a-z_]+)'/g)) records.add(m[1]!);
  }
  return { actions, records };
}

describe('no internal codes on screens', () => {
  it('every audit action and record kind the server writes has a label', () => {
    const { actions, records } = writtenAuditCodes();
    expect(actions.size).toBeGreaterThan(30);
    expect(actions).toContain('role.revoked');
    expect([...actions].filter((a) => !(a in LABELS.auditAction))).toEqual([]);
    expect([...records].filter((r) => !(r in LABELS.record))).toEqual([]);
    expect(labelOf('auditAction', 'screening.decide')).toBe('Screening decision');
    expect(auditRecordText('import_batch', '7')).toBe('Import 7');
  });

  it('a state badge shows the state’s label and a symbol, the code only in data-state', () => {
    for (const state of new Set([...EXTRACTION_STATES, ...ASSIGNMENT_STATES, ...MAIL_STATUSES])) {
      expect(LABELS.state, state).toHaveProperty(state);
      const html = renderToStaticMarkup(createElement(StateBadge, { state }));
      expect(html).toContain(`data-state="${state}"`);
      expect(html.replace(/<[^>]*>/g, '')).toMatch(new RegExp(`${LABELS.state[state as keyof typeof LABELS.state]}$`));
    }
    expect(renderToStaticMarkup(createElement(StateBadge, { state: 'disputed' })).replace(/<[^>]*>/g, '')).toBe('≠Disputed');
  });

  it('a followed request is summarised with filter and value labels, never raw keys', () => {
    const summary = followedRequestSummary({
      filters: { manipulation: ['numerosity', 'looming_receding'], outcome: 'duration_distortion', population: 'older_adults', modality: 'visual', task: 'reproduction', yearFrom: 2000 },
      method: 'REML',
    });
    expect(summary).toMatch(/^Manipulation: Numerosity, Looming vs receding; Outcome kind: Duration distortion; Population: Older adults; Modality: Visual; Task: Reproduction; years 2000–…/);
    expect(summary).not.toMatch(/\b(manipulation|outcome|population|modality|task):|_/);
  });

  it('audit details read as text, not JSON', () => {
    expect(auditDetailsText({ role: 'curator', login: 'dario' })).toBe('role: Curator; login: dario');
    expect(auditDetailsText({ decision: 'excluded', reason: 'wrong_population', note: null, previous: 'unscreened', withdrawnRecords: [] })).toBe(
      `decision: Excluded; reason: ${LABELS.exclusionReason.wrong_population}; before: Not yet screened; records withdrawn: none`,
    );
    expect(auditDetailsText({ referenceId: 12, kind: 'matched', recordVersion: 2, assignmentId: null })).toBe('reference 12; kind: matched; record version: 2');
    expect(auditDetailsText({ registryVersion: 9, k: 4, metric: 'g_s', method: 'DL' })).toBe(`registry version: 9; studies: 4; metric: ${labelOf('metric', 'g_s')}; method: DerSimonian–Laird`);
    const nested = auditDetailsText({ reason: 'typo in SD', before: { effect: 0.41, variance: 0.02 }, after: { effect: 0.39, variance: 0.02 } });
    expect(nested).toBe('reason: typo in SD; before: (effect: 0.41; variance: 0.02); after: (effect: 0.39; variance: 0.02)');
    for (const text of [nested, auditDetailsText({ changed: { title: 'New', year: 2019 }, version: 3 })]) expect(text).not.toMatch(/[{}"]/);
  });
});
