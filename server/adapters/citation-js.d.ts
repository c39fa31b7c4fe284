// citation-js ships no type declarations; these cover what server/adapters/citations.ts uses.
declare module '@citation-js/core' {
  export class Cite {
    constructor(data?: unknown, options?: Record<string, unknown>);
    static async(data: unknown, options?: Record<string, unknown>): Promise<Cite>;
    data: Array<Record<string, unknown>>;
    format(format: string, options?: Record<string, unknown>): string | object;
  }
  export const plugins: {
    add(ref: string, plugin: Record<string, unknown>): void;
    input: {
      chain(data: unknown, options?: Record<string, unknown>): unknown;
      chainAsync(data: unknown, options?: Record<string, unknown>): Promise<unknown>;
      type(data: unknown): string;
    };
  };
  export const util: {
    fetchFileAsync(url: string, options?: Record<string, unknown>): Promise<string>;
  };
}
declare module '@citation-js/plugin-doi' {
  export const parsers: { json: { default?: (data: unknown) => Record<string, unknown>; parse?: (data: unknown) => Record<string, unknown> } };
}
declare module '@citation-js/plugin-bibtex';
declare module '@citation-js/plugin-ris';
