/** PostgreSQL SQLSTATE classes and codes that mean "the server is away for now", not a bad query. */
const UNAVAILABLE_SQLSTATES = new Set(['57P01', '57P02', '57P03', '53300']);
const UNAVAILABLE_SOCKET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENOTFOUND', 'EAI_AGAIN']);
const UNAVAILABLE_MESSAGES = /Connection terminated|Client has encountered a connection error|Knex: Timeout acquiring a connection|timeout exceeded when trying to connect|Client was closed and is not queryable|Connection ended unexpectedly/i;

/** Whether an error says the database cannot be reached just now (restart, shutdown, refused or dropped connection). */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 3) return false;
  const e = err as { code?: unknown; message?: unknown; name?: unknown; errors?: unknown };
  if (typeof e.code === 'string' && (UNAVAILABLE_SOCKET_CODES.has(e.code) || UNAVAILABLE_SQLSTATES.has(e.code) || e.code.startsWith('08'))) return true;
  if (e.name === 'KnexTimeoutError') return true;
  if (typeof e.message === 'string' && UNAVAILABLE_MESSAGES.test(e.message)) return true;
  if (Array.isArray(e.errors) && e.errors.some((x) => isDatabaseUnavailable(x, depth + 1))) return true;
  return false;
}
