export type Doc = Record<string, unknown>;
export type Settings = {
  searchableAttributes: string[];
  filterableAttributes: string[];
  sortableAttributes: string[];
  displayedAttributes: string[];
  [k: string]: unknown;
};

/** Case- and accent-folded text, as the index compares it. */
export const fold = (s: string) =>
  s
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase();
