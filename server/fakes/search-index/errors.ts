/** An error the way Meilisearch reports it: HTTP status, code and type. */
export class MeiliError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly type = 'invalid_request',
  ) {
    super(message);
  }
}

export const errorLink = (code: string) => `https://docs.meilisearch.com/errors#${code}`;
