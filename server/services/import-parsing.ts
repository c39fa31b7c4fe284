// Splits an import file into entries and turns each into CSL-JSON or a rejection a person understands.
import { normaliseDoi, REFERENCE_LIMITS } from '../../shared/schemas/references.js';
import { parseEntry } from '../adapters/citations.js';
import { cslTitle, cslYear, type Csl } from './reference-fields.js';

export interface RawEntry {
  index: number;
  key?: string;
  line: number;
  text: string;
}

export type ParsedEntry = (RawEntry & { ok: true; csl: Csl }) | (RawEntry & { ok: false; message: string });

const ENTRY_START = /@([A-Za-z]+)\s*([{(])/y;
const NEXT_ENTRY = /\n[ \t]*@[A-Za-z]+\s*[{(]/y;

/**
 * BibTeX: each `@type{…}` entry on its own, braces balanced. An entry that never closes ends where the next
 * line starting with `@type{` begins, so one broken entry cannot swallow the rest of the file.
 * `@string` definitions are kept and handed to every entry; `@comment` and `@preamble` are skipped.
 */
export function splitBibtex(text: string): { strings: string; entries: RawEntry[] } {
  const entries: RawEntry[] = [];
  const strings: string[] = [];
  let pos = 0;
  let line = 1;
  let index = 0;
  const countLines = (from: number, to: number) => {
    let n = 0;
    for (let i = from; i < to; i++) if (text.charCodeAt(i) === 10) n++;
    return n;
  };
  while (pos < text.length) {
    const at = text.indexOf('@', pos);
    if (at < 0) break;
    line += countLines(pos, at);
    ENTRY_START.lastIndex = at;
    const m = ENTRY_START.exec(text);
    if (!m) {
      pos = at + 1;
      continue;
    }
    const type = m[1].toLowerCase();
    const open = m[2];
    const close = open === '{' ? '}' : ')';
    let depth = 0;
    let end = -1;
    for (let i = at + m[0].length - 1; i < text.length; i++) {
      const c = text[i];
      if (c === '{' || (open === '(' && c === '(')) depth++;
      else if (c === '}' || (open === '(' && c === ')')) {
        depth--;
        if (depth === 0 && c === close) {
          end = i + 1;
          break;
        }
      } else if (c === '\n' && depth > 0) {
        // A new entry starting on the next line means this one was never closed.
        NEXT_ENTRY.lastIndex = i;
        if (NEXT_ENTRY.test(text)) {
          end = i;
          break;
        }
      }
    }
    if (end < 0) end = text.length;
    const chunk = text.slice(at, end);
    if (type === 'string') strings.push(chunk);
    else if (type !== 'comment' && type !== 'preamble') {
      index++;
      const key = chunk.match(/^@[A-Za-z]+\s*[{(]\s*([^,\s]+)\s*,/)?.[1];
      entries.push({ index, key, line, text: chunk });
    }
    line += countLines(at, end);
    pos = end;
  }
  return { strings: strings.join('\n'), entries };
}

/** RIS: records from `TY  -` to `ER  -`. */
export function splitRis(text: string): RawEntry[] {
  const lines = text.replace(/\r\n?/g, '\n').split('\n');
  const entries: RawEntry[] = [];
  let current: string[] | null = null;
  let start = 0;
  const flush = () => {
    if (current && current.some((l) => l.trim())) {
      const body = current.join('\n');
      const key = body.match(/^ID {2}- (.+)$/m)?.[1]?.trim();
      entries.push({ index: entries.length + 1, key, line: start, text: body.endsWith('\n') ? body : `${body}\n` });
    }
    current = null;
  };
  lines.forEach((l, i) => {
    if (/^TY {2}-/.test(l)) {
      flush();
      current = [l];
      start = i + 1;
    } else if (/^ER {2}-/.test(l)) {
      if (current) {
        current.push(l);
        flush();
      } else {
        entries.push({ index: entries.length + 1, line: i + 1, text: l });
      }
    } else if (current) current.push(l);
    else if (l.trim()) {
      // Text outside any record: report it once as a malformed entry.
      if (!entries.length || entries[entries.length - 1].key !== '(stray text)' || entries[entries.length - 1].line + 1 < i + 1) {
        entries.push({ index: entries.length + 1, key: '(stray text)', line: i + 1, text: l });
      } else entries[entries.length - 1].text += `\n${l}`;
    }
  });
  flush();
  return entries;
}

export function describeEntry(e: RawEntry, format: 'bibtex' | 'ris' | 'doi'): string {
  if (format === 'doi') return `Line ${e.line}`;
  return `Entry ${e.index}${e.key && e.key !== '(stray text)' ? ` (key "${e.key}")` : ''}, line ${e.line}`;
}

const tooLong = (field: string, n: number, max: number) => `field ${field} has ${n.toLocaleString('en')} characters; at most ${max.toLocaleString('en')} are allowed (as when editing a reference)`;
const textOf = (v: unknown) => (Array.isArray(v) ? v.join(' ') : typeof v === 'string' ? v : '');

/** The same length caps as an edit (REFERENCE_LIMITS): the first field over its cap, in words, or null. */
export function fieldLengthProblem(csl: Csl): string | null {
  const L = REFERENCE_LIMITS;
  const title = cslTitle(csl);
  if (title.length > L.title) return tooLong('title', title.length, L.title);
  const container = textOf(csl['container-title']).trim();
  if (container.length > L.container) return tooLong('journal (container)', container.length, L.container);
  const abstract = textOf(csl.abstract);
  if (abstract.length > L.abstract) return tooLong('abstract', abstract.length, L.abstract);
  const doi = String(csl.DOI ?? '').trim();
  if (doi.length > L.doi) return tooLong('doi', doi.length, L.doi);
  const people = [...(Array.isArray(csl.author) ? csl.author : []), ...(Array.isArray(csl.editor) ? csl.editor : [])];
  if (people.length > L.authors) return `the entry names ${people.length.toLocaleString('en')} authors and editors; at most ${L.authors} are allowed`;
  for (const [i, p] of people.entries()) {
    for (const part of ['family', 'given', 'literal'] as const) {
      const n = typeof p?.[part] === 'string' ? (p[part] as string).length : 0;
      if (n > L.name) return tooLong(`author ${i + 1} (${part} name)`, n, L.name);
    }
  }
  return null;
}

/** What the registry needs of a record; returns the problem in words or null. */
export function checkCsl(csl: Csl): string | null {
  if (!cslTitle(csl)) return 'field title is missing';
  const long = fieldLengthProblem(csl);
  if (long) return long;
  const issued = csl.issued;
  if (issued && cslYear(csl) === null) {
    const shown = issued.literal ?? issued.raw ?? JSON.stringify(issued['date-parts'] ?? issued);
    return `field year "${String(shown).slice(0, 40)}" is not a year`;
  }
  const y = cslYear(csl);
  if (y !== null && (y < 1000 || y > new Date().getFullYear() + 2)) return `field year "${y}" is out of range`;
  if (csl.DOI !== undefined && csl.DOI !== null && String(csl.DOI).trim() !== '' && !normaliseDoi(String(csl.DOI))) {
    return `field doi "${String(csl.DOI).slice(0, 60)}" is not a DOI (a DOI looks like 10.5555/abc)`;
  }
  return null;
}

const firstLine = (msg: string) => msg.split('\n')[0].trim();

const TOKEN_WORDS: Record<string, string> = { rbrace: 'a `}`', lbrace: 'a `{`', equals: 'a `=`', comma: 'a comma', identifier: 'a field name', text: 'a value', quote: 'a `"`', number: 'a number' };
const tokenWords = (t: string) => TOKEN_WORDS[t.replace(/"/g, '')] ?? t;

/**
 * The BibTeX parser's complaint ("expected "rbrace", got EOF at line 1 col 57") in words, on the file's own line:
 * "Entry 5 is not closed: a `}` is missing (key "x", line 12)".
 */
export function explainBibtexError(message: string, e: RawEntry): string {
  const m = /expected "?(\w+)"?, got ("?\w+"?|EOF) at line (\d+) col (\d+)/i.exec(message);
  const key = e.key ? `key "${e.key}", ` : '';
  if (!m) return `Entry ${e.index} is not well formed (${key}line ${e.line}): ${message}`;
  const [, expected, got, relLine, col] = m;
  const line = e.line + Number(relLine) - 1;
  if (got === 'EOF') {
    const openQuote = (e.text.match(/(?<!\\)"/g)?.length ?? 0) % 2 === 1;
    return `Entry ${e.index} is not closed: ${openQuote ? 'a `"`' : 'a `}`'} is missing (${key}the entry starts on line ${e.line})`;
  }
  const what = expected === 'rbrace' && got.replace(/"/g, '') === 'identifier' ? 'a comma is missing between two fields' : `${tokenWords(expected)} is missing (found ${tokenWords(got.replace(/"/g, ''))} instead)`;
  return `Entry ${e.index} is not well formed: ${what} (${key}line ${line}, column ${col})`;
}

/** A file cut into its raw entries (and BibTeX's @string definitions, handed to each). */
export function splitEntries(format: 'bibtex' | 'ris', text: string): { strings: string; entries: RawEntry[] } {
  return format === 'bibtex' ? splitBibtex(text) : { strings: '', entries: splitRis(text) };
}

/** About how many entries a text holds, without reading them (decides whether an import runs as a job). */
export function countEntriesRoughly(format: 'bibtex' | 'ris', text: string): number {
  const re = format === 'bibtex' ? /@(?!(?:string|comment|preamble)\s*[{(])[A-Za-z]+\s*[{(]/gi : /^TY {2}-/gm;
  let n = 0;
  while (re.exec(text)) n++;
  return n;
}

export function parseEntries(format: 'bibtex' | 'ris', text: string): ParsedEntry[] {
  const { strings, entries } = splitEntries(format, text);
  return parseRawEntries(format, strings, entries);
}

export function parseRawEntries(format: 'bibtex' | 'ris', strings: string, entries: RawEntry[]): ParsedEntry[] {
  return entries.map((e): ParsedEntry => {
    const where = describeEntry(e, format);
    if (format === 'ris' && !/^TY {2}-/.test(e.text)) {
      return { ...e, ok: false, message: `${where}: text outside a record (a RIS record starts with "TY  -" and ends with "ER  -")` };
    }
    if (format === 'ris' && !/^ER {2}-/m.test(e.text)) {
      return { ...e, ok: false, message: `${where}: the record has no "ER  -" line, so it may be cut short` };
    }
    let records: Csl[];
    try {
      // BibTeX DOIs need no rescue; RIS's parser drops DOIs that do not look like 10.NNNN/…, so check the raw field.
      records = parseEntry(strings ? `${strings}\n${e.text}` : e.text, format);
    } catch (err) {
      return { ...e, ok: false, message: format === 'bibtex' ? explainBibtexError(firstLine((err as Error).message), e) : `${where}: the entry is not well formed — ${firstLine((err as Error).message)}` };
    }
    if (records.length !== 1) return { ...e, ok: false, message: `${where}: the entry could not be read as one record` };
    const csl = records[0];
    if (format === 'ris' && !csl.DOI) {
      const raw = e.text.match(/^DO {2}- (.+)$/m)?.[1]?.trim();
      if (raw) csl.DOI = raw;
    }
    const problem = checkCsl(csl);
    if (problem) return { ...e, ok: false, message: `${where}: ${problem}` };
    return { ...e, ok: true, csl };
  });
}

/** A list of DOIs, one per line (commas, semicolons or spaces also separate); URL and "doi:" forms accepted. */
export function parseDoiList(text: string): Array<RawEntry & { doi: string | null }> {
  const out: Array<RawEntry & { doi: string | null }> = [];
  text.split(/\r?\n/).forEach((l, i) => {
    for (const token of l.split(/[\s,;]+/).filter(Boolean)) {
      out.push({ index: out.length + 1, line: i + 1, text: token, key: token, doi: normaliseDoi(token) });
    }
  });
  return out;
}
