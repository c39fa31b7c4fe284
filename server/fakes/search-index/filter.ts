import { MeiliError } from './errors.js';
import { fold, type Doc } from './documents.js';

// Filter expressions: the subset of Meilisearch's syntax (=, !=, >, >=, <, <=, TO, IN, NOT, AND, OR, EXISTS, IS NULL, parentheses)

export type Pred = (doc: Doc) => boolean;
type Token = { t: 'word' | 'str' | 'op' | 'lp' | 'rp' | 'lb' | 'rb' | 'comma'; v: string };

function tokenize(src: string): Token[] {
  const out: Token[] = [];
  let i = 0;
  while (i < src.length) {
    const c = src[i];
    if (/\s/.test(c)) {
      i++;
    } else if (c === '(' || c === ')' || c === '[' || c === ']' || c === ',') {
      out.push({ t: c === '(' ? 'lp' : c === ')' ? 'rp' : c === '[' ? 'lb' : c === ']' ? 'rb' : 'comma', v: c });
      i++;
    } else if (c === '"' || c === "'") {
      let j = i + 1;
      let s = '';
      while (j < src.length && src[j] !== c) {
        if (src[j] === '\\' && j + 1 < src.length) j++;
        s += src[j++];
      }
      if (j >= src.length) throw new MeiliError(400, 'invalid_search_filter', `Unterminated string in filter at position ${i}.`);
      out.push({ t: 'str', v: s });
      i = j + 1;
    } else if (/[=!<>]/.test(c)) {
      const two = src.slice(i, i + 2);
      if (two === '!=' || two === '>=' || two === '<=') {
        out.push({ t: 'op', v: two });
        i += 2;
      } else if (c === '=' || c === '<' || c === '>') {
        out.push({ t: 'op', v: c });
        i++;
      } else throw new MeiliError(400, 'invalid_search_filter', `Unexpected "${c}" in filter at position ${i}.`);
    } else {
      let j = i;
      while (j < src.length && !/[\s()[\],=!<>"']/.test(src[j])) j++;
      out.push({ t: 'word', v: src.slice(i, j) });
      i = j;
    }
  }
  return out;
}

const asNumber = (v: unknown) => (typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' && !Number.isNaN(Number(v)) ? Number(v) : NaN);
export const getPath = (doc: Doc, attr: string): unknown => (attr.includes('.') ? attr.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Doc)[k] : undefined), doc) : doc[attr]);
const NON_ASCII = /[^\u0020-\u007e]/;

/** A test "attribute value equals v", with v's forms worked out once (filters run over every document). */
function equalsTo(v: string): (a: unknown) => boolean {
  const n = asNumber(v);
  const low = v.toLowerCase();
  const folded = fold(v);
  const bool = low === 'true' ? true : low === 'false' ? false : null;
  return (a) => {
    if (a === null || a === undefined) return false;
    if (typeof a === 'number') return a === n;
    if (typeof a === 'boolean') return a === bool;
    const s = typeof a === 'string' ? a : String(a);
    if (s === v) return true;
    const sl = s.toLowerCase();
    return sl === low || (NON_ASCII.test(s) || NON_ASCII.test(v) ? fold(s) === folded : false);
  };
}

function compareTo(op: string, b: string): (a: unknown) => boolean {
  const y = asNumber(b);
  if (Number.isNaN(y)) return () => false;
  return (a) => {
    const x = typeof a === 'number' ? a : asNumber(a);
    if (Number.isNaN(x)) return false;
    return op === '>' ? x > y : op === '>=' ? x >= y : op === '<' ? x < y : x <= y;
  };
}

/** Whether any value of the attribute (one value, or each element of an array) passes. */
const anyOf = (attr: string, test: (a: unknown) => boolean) => (d: Doc) => {
  const v = getPath(d, attr);
  if (Array.isArray(v)) return v.some(test);
  return v !== undefined && test(v);
};

export function parseFilter(src: string, filterable: string[]): Pred {
  const toks = tokenize(src);
  let p = 0;
  const peek = () => toks[p];
  const isWord = (w: string) => peek()?.t === 'word' && peek().v.toUpperCase() === w;
  const fail = (msg: string): never => {
    throw new MeiliError(400, 'invalid_search_filter', `${msg} (in filter \`${src}\`).`);
  };
  const value = (): string => {
    const t = toks[p++];
    if (!t || (t.t !== 'word' && t.t !== 'str')) fail('Expected a value');
    return t.v;
  };
  const checkAttr = (attr: string) => {
    if (!filterable.includes(attr)) {
      fail(`Attribute \`${attr}\` is not filterable. Available filterable attributes are: \`${filterable.join(', ')}\``);
    }
  };
  const condition = (): Pred => {
    const t = toks[p++];
    if (!t || (t.t !== 'word' && t.t !== 'str')) fail('Expected an attribute');
    const attr = t.v;
    checkAttr(attr);
    if (isWord('EXISTS')) {
      p++;
      return (d) => getPath(d, attr) !== undefined;
    }
    if (isWord('IS')) {
      p++;
      const neg = isWord('NOT') ? (p++, true) : false;
      if (!isWord('NULL') && !isWord('EMPTY')) fail('Expected NULL or EMPTY after IS');
      const kind = toks[p++].v.toUpperCase();
      const test: Pred =
        kind === 'NULL'
          ? (d) => getPath(d, attr) === null
          : (d) => {
              const v = getPath(d, attr);
              return v === '' || (Array.isArray(v) && v.length === 0) || (typeof v === 'object' && v !== null && !Array.isArray(v) && Object.keys(v).length === 0);
            };
      return neg ? (d) => !test(d) : test;
    }
    let negIn = false;
    if (isWord('NOT')) {
      p++;
      if (isWord('EXISTS')) {
        p++;
        return (d) => getPath(d, attr) === undefined;
      }
      negIn = true;
      if (!isWord('IN')) fail('Expected IN or EXISTS after NOT');
    }
    if (isWord('IN')) {
      p++;
      if (peek()?.t !== 'lb') fail('Expected [ after IN');
      p++;
      const list: string[] = [];
      while (peek() && peek().t !== 'rb') {
        list.push(value());
        if (peek()?.t === 'comma') p++;
      }
      if (peek()?.t !== 'rb') fail('Expected ] to close IN');
      p++;
      const tests = list.map(equalsTo);
      const test: Pred = anyOf(attr, (v) => tests.some((t) => t(v)));
      return negIn ? (d) => !test(d) : test;
    }
    const op = peek();
    if (op?.t === 'op') {
      p++;
      const v = value();
      if (op.v === '=') return anyOf(attr, equalsTo(v));
      if (op.v === '!=') {
        const eq = anyOf(attr, equalsTo(v));
        return (d) => !eq(d);
      }
      return anyOf(attr, compareTo(op.v, v));
    }
    // "attr low TO high"
    const low = value();
    if (!isWord('TO')) fail(`Expected an operator after \`${attr}\``);
    p++;
    const high = value();
    const ge = compareTo('>=', low);
    const le = compareTo('<=', high);
    return anyOf(attr, (x) => ge(x) && le(x));
  };
  const primary = (): Pred => {
    if (isWord('NOT')) {
      p++;
      const inner = primary();
      return (d) => !inner(d);
    }
    if (peek()?.t === 'lp') {
      p++;
      const inner = or();
      if (peek()?.t !== 'rp') fail('Expected )');
      p++;
      return inner;
    }
    return condition();
  };
  const and = (): Pred => {
    const parts = [primary()];
    while (isWord('AND')) {
      p++;
      parts.push(primary());
    }
    return parts.length === 1 ? parts[0] : (d) => parts.every((f) => f(d));
  };
  const or = (): Pred => {
    const parts = [and()];
    while (isWord('OR')) {
      p++;
      parts.push(and());
    }
    return parts.length === 1 ? parts[0] : (d) => parts.some((f) => f(d));
  };
  if (!toks.length) return () => true;
  const pred = or();
  if (p < toks.length) fail(`Unexpected \`${toks[p].v}\``);
  return pred;
}

/** A filter as the client sends it: a string, or an array (AND) whose nested arrays are ORs. */
export function buildFilter(filter: unknown, filterable: string[]): Pred | null {
  if (filter === undefined || filter === null || filter === '') return null;
  if (typeof filter === 'string') return parseFilter(filter, filterable);
  if (Array.isArray(filter)) {
    const parts = filter.map((f) => {
      if (Array.isArray(f)) {
        const ors = f.map((g) => buildFilter(g, filterable)).filter(Boolean) as Pred[];
        return (d: Doc) => ors.some((o) => o(d));
      }
      return buildFilter(f, filterable) ?? (() => true);
    });
    return (d) => parts.every((f) => f(d));
  }
  throw new MeiliError(400, 'invalid_search_filter', 'Invalid syntax for the filter parameter: expected a string or an array.');
}
