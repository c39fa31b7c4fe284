import Papa from 'papaparse';

/** One row as stored: a single trial is n = 1 with k = its response. */
export interface TrialRow {
  line: number;
  participant: string;
  condition: string;
  level: number;
  n: number;
  k: number;
}

export type TrialFormat = 'trials' | 'counts';

export interface TrialCsvError {
  line: number;
  message: string;
}

export interface ParsedTrials {
  format: TrialFormat | null;
  rows: TrialRow[];
  errors: TrialCsvError[];
}

export const TRIAL_COLUMNS = ['participant', 'condition', 'level', 'response'] as const;
export const COUNT_COLUMNS = ['participant', 'condition', 'level', 'n', 'k'] as const;
/** The largest upload (bytes) and number of data rows taken at once. */
export const TRIAL_UPLOAD_MAX_BYTES = 5 * 1024 * 1024;
export const TRIAL_UPLOAD_MAX_ROWS = 250_000;
/** At most this many row errors are listed; the rest are counted. */
export const TRIAL_ERRORS_LISTED = 50;

const LABEL_MAX = 60;

function parseNumber(raw: string): number | null {
  const t = raw.trim();
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

function parseWhole(raw: string): number | null {
  const v = parseNumber(raw);
  return v !== null && Number.isInteger(v) ? v : null;
}

/**
 * Reads an upload of trials (participant, condition, level in ms, response 0/1) or of per-level counts
 * (participant, condition, level, n, k). The header says which. Every bad row gets its own message in words;
 * a file with any error is refused as a whole, so the coder fixes it and uploads again.
 */
export function parseTrialsCsv(text: string, maxRows = TRIAL_UPLOAD_MAX_ROWS): ParsedTrials {
  const errors: TrialCsvError[] = [];
  const clean = text.replace(/^\uFEFF/, '');
  if (clean.trim() === '') return { format: null, rows: [], errors: [{ line: 1, message: 'the file is empty: the first line names the columns' }] };
  const parsed = Papa.parse<Record<string, string>>(clean.trim(), {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: (h) => h.trim().toLowerCase(),
  });
  const fields = parsed.meta.fields ?? [];
  const has = (cols: readonly string[]) => cols.every((c) => fields.includes(c));
  const format: TrialFormat | null = has(TRIAL_COLUMNS) ? 'trials' : has(COUNT_COLUMNS) ? 'counts' : null;
  if (!format) {
    const missingTrials = TRIAL_COLUMNS.filter((c) => !fields.includes(c));
    const missingCounts = COUNT_COLUMNS.filter((c) => !fields.includes(c));
    return {
      format: null,
      rows: [],
      errors: [
        {
          line: 1,
          message: `the first line must name the columns participant, condition, level and response (one row per trial) or participant, condition, level, n and k (counts per level); missing ${missingTrials.length <= missingCounts.length ? missingTrials.join(', ') : missingCounts.join(', ')}`,
        },
      ],
    };
  }
  const expected: readonly string[] = format === 'trials' ? TRIAL_COLUMNS : COUNT_COLUMNS;
  const extra = fields.filter((f) => !expected.includes(f));
  if (extra.length) errors.push({ line: 1, message: `unknown column${extra.length > 1 ? 's' : ''} ${extra.join(', ')}: only ${expected.join(', ')} are read` });
  if (parsed.data.length > maxRows) {
    return { format, rows: [], errors: [{ line: maxRows + 2, message: `the file has ${parsed.data.length.toLocaleString('en')} rows; at most ${maxRows.toLocaleString('en')} are taken at once` }] };
  }
  for (const e of parsed.errors) {
    if (e.code === 'UndetectableDelimiter') continue;
    errors.push({ line: (e.row ?? 0) + 2, message: e.code === 'TooFewFields' || e.code === 'TooManyFields' ? `expected ${expected.length} values separated by commas (${e.message.toLowerCase()})` : e.message });
  }
  const rows: TrialRow[] = [];
  parsed.data.forEach((raw, idx) => {
    const line = idx + 2;
    const problems: string[] = [];
    const get = (k: string) => (raw[k] ?? '').trim();
    const participant = get('participant');
    const condition = get('condition');
    if (!participant) problems.push('participant is empty');
    else if (participant.length > LABEL_MAX) problems.push(`participant is longer than ${LABEL_MAX} characters`);
    if (!condition) problems.push('condition is empty');
    else if (condition.length > LABEL_MAX) problems.push(`condition is longer than ${LABEL_MAX} characters`);
    const level = parseNumber(get('level'));
    if (level === null) problems.push(`level must be a number of ms (got "${get('level')}")`);
    let n = 1;
    let k = 0;
    if (format === 'trials') {
      const r = get('response');
      if (r !== '0' && r !== '1') problems.push(`response must be 0 or 1 (got "${r}")`);
      else k = Number(r);
    } else {
      const nv = parseWhole(get('n'));
      const kv = parseWhole(get('k'));
      if (nv === null || nv < 1) problems.push(`n must be a whole number of trials of at least 1 (got "${get('n')}")`);
      if (kv === null || kv < 0) problems.push(`k must be a whole count of at least 0 (got "${get('k')}")`);
      if (nv !== null && kv !== null && nv >= 1 && kv > nv) problems.push(`k (${kv}) cannot be more than n (${nv})`);
      n = nv ?? 1;
      k = kv ?? 0;
    }
    if (problems.length) errors.push({ line, message: problems.join('; ') });
    else rows.push({ line, participant, condition, level: level!, n, k });
  });
  if (errors.length === 0 && rows.length === 0) errors.push({ line: 2, message: 'the file has a header but no rows' });
  errors.sort((a, b) => a.line - b.line);
  return { format, rows, errors };
}

export interface LevelCounts {
  participant: string;
  condition: string;
  x: number[];
  n: number[];
  k: number[];
}

/** Rows summed per participant × condition × level (levels ascending), in first-seen order of participants and conditions. */
export function countsByCell(rows: readonly Pick<TrialRow, 'participant' | 'condition' | 'level' | 'n' | 'k'>[]): LevelCounts[] {
  const cells = new Map<string, { participant: string; condition: string; levels: Map<number, { n: number; k: number }> }>();
  for (const r of rows) {
    const key = JSON.stringify([r.participant, r.condition]);
    let c = cells.get(key);
    if (!c) cells.set(key, (c = { participant: r.participant, condition: r.condition, levels: new Map() }));
    const l = c.levels.get(r.level);
    if (l) {
      l.n += r.n;
      l.k += r.k;
    } else c.levels.set(r.level, { n: r.n, k: r.k });
  }
  return [...cells.values()].map((c) => {
    const levels = [...c.levels.entries()].sort((a, b) => a[0] - b[0]);
    return { participant: c.participant, condition: c.condition, x: levels.map((l) => l[0]), n: levels.map((l) => l[1].n), k: levels.map((l) => l[1].k) };
  });
}
