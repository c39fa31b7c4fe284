// citation-js set up once for the server: BibTeX, RIS and DOI input, BibTeX output, and DOI resolvers whose
// base URL is configuration (the DOI plugin itself always fetches https://doi.org).
import { Cite, plugins, util } from '@citation-js/core';
import '@citation-js/plugin-bibtex';
import '@citation-js/plugin-ris';
import * as doiPlugin from '@citation-js/plugin-doi';

const CSL_ACCEPT = 'application/vnd.citationstyles.csl+json';

const parseDoiJson = (doiPlugin.parsers.json.default ?? doiPlugin.parsers.json.parse)!;

/** Fetches one DOI record; the URL is already the configured resolver's (see createDoiResolver). */
async function fetchCsl(url: string): Promise<Record<string, unknown>> {
  const text: string = await util.fetchFileAsync(url, { checkContentType: true, headers: { Accept: CSL_ACCEPT } });
  if (text === '[]') return {};
  return parseDoiJson(JSON.parse(text));
}

plugins.add('@doi', {
  input: {
    '@doi/api': {
      parse: () => {
        // The synchronous path blocks the event loop (and deadlocks against a resolver in this process).
        throw new Error('DOI lookup is asynchronous here; use Cite.async or chainAsync.');
      },
      parseAsync: (data: string | string[]) => Promise.all(([] as string[]).concat(data).map(fetchCsl)),
      parseType: {
        dataType: 'String',
        predicate: /^\s*(https?:\/\/(?:dx\.)?doi\.org\/(10.\d{4,9}\/[-._;()/:A-Z0-9[\]<>]+))\s*$/i,
        extends: '@else/url',
      },
    },
  },
});

export class DoiLookupError extends Error {
  constructor(
    message: string,
    readonly kind: 'not_found' | 'timeout' | 'resolver_error' | 'bad_record' | 'unreachable',
  ) {
    super(message);
  }
  /** The resolver is away (refused or dropped connection, a gateway's 502/503/504): worth asking again later. */
  get transient(): boolean {
    return this.kind === 'unreachable';
  }
}

export interface CslName {
  family?: string;
  given?: string;
  literal?: string;
}
export interface CslDate {
  'date-parts'?: Array<Array<string | number>>;
  literal?: string;
  raw?: string;
}
/** A CSL-JSON record: the fields the registry reads, typed; the rest kept as they came. */
export interface Csl {
  [field: string]: unknown;
  id?: string;
  title?: string | string[];
  author?: CslName[];
  editor?: CslName[];
  issued?: CslDate;
  'published-print'?: CslDate;
  'published-online'?: CslDate;
  'container-title'?: string | string[];
  DOI?: string;
  abstract?: string;
}
export type DoiResolver = (doi: string) => Promise<Csl>;

/**
 * A DOI resolver at a configured base URL (https://doi.org in production, the local stand-in in development and
 * tests): resolves one DOI to CSL-JSON through citation-js's DOI parser, giving up after `timeoutMs`.
 */
export function createDoiResolver(config: { baseUrl: string; timeoutMs: number }): DoiResolver {
  const base = config.baseUrl.replace(/\/+$/, '');
  return (doi) => resolveDoi(`${base}/${doi.split('/').map(encodeURIComponent).join('/')}`, config.timeoutMs);
}

async function resolveDoi(url: string, timeoutMs: number): Promise<Csl> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_r, reject) => {
    timer = setTimeout(() => reject(new DoiLookupError(`the DOI resolver did not answer within ${(timeoutMs / 1000).toFixed(1)} s`, 'timeout')), timeoutMs);
  });
  try {
    // Typed as a DOI API address, so DOIs with characters citation-js's own DOI pattern does not accept
    // (parentheses are fine, `{` or `$` are not) still go through the plugin.
    const chain = plugins.input.chainAsync(url, { target: '@csl/list+object', generateGraph: false, forceType: '@doi/api' });
    const list = (await Promise.race([chain, timeout])) as Csl[];
    const record = list?.[0];
    if (!record || !record.title) throw new DoiLookupError('the resolver returned a record without a title', 'bad_record');
    return record;
  } catch (err) {
    if (err instanceof DoiLookupError) throw err;
    const status = (err as { status?: number }).status;
    if (status === 404) throw new DoiLookupError('no such DOI at the resolver (404)', 'not_found');
    if (status === 502 || status === 503 || status === 504) throw new DoiLookupError(`the DOI resolver is unavailable (HTTP ${status})`, 'unreachable');
    if (status) throw new DoiLookupError(`the DOI resolver failed (HTTP ${status})`, 'resolver_error');
    throw new DoiLookupError(`the DOI resolver could not be reached (${(err as Error).message})`, 'unreachable');
  } finally {
    clearTimeout(timer);
  }
}

/** Parses one BibTeX or RIS entry to CSL-JSON records (throws citation-js's parse error). */
export function parseEntry(text: string, format: 'bibtex' | 'ris'): Record<string, unknown>[] {
  const type = format === 'bibtex' ? '@biblatex/text' : '@ris/file';
  return plugins.input.chain(text, { target: '@csl/list+object', generateGraph: false, forceType: type }) as Record<string, unknown>[];
}

export function toBibtex(records: Record<string, unknown>[]): string {
  return new Cite(records).format('bibtex', { format: 'text' }) as string;
}

/** One CSL-JSON record as a BibTeX and an RIS entry. */
export function cslEntries(record: Record<string, unknown>): { bibtex: string; ris: string } {
  const cite = new Cite([record]);
  return { bibtex: cite.format('bibtex', { format: 'text' }) as string, ris: cite.format('ris', { format: 'text' }) as string };
}
