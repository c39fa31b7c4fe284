import type { ApiError } from '../../shared/schemas/common';

/** The one HTTP client: same-origin JSON with cookies; every failure becomes an ApiRequestError. */
export class ApiRequestError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: Array<{ path: string; message: string }> | unknown,
  ) {
    super(message);
  }

  /** Field messages keyed by the path after the first segment ("body.studies.0.n" → "studies.0.n"). */
  fieldErrors(): Record<string, string> {
    const out: Record<string, string> = {};
    if (Array.isArray(this.details)) {
      for (const d of this.details as Array<{ path?: string; message?: string }>) {
        if (d.path && d.message) out[d.path.split('.').slice(1).join('.')] = d.message;
      }
    }
    return out;
  }
}

type Options = { method?: string; body?: unknown; signal?: AbortSignal; raw?: boolean };

export async function api<T>(path: string, opts: Options = {}): Promise<T> {
  const isForm = typeof FormData !== 'undefined' && opts.body instanceof FormData;
  const res = await fetch(path, {
    method: opts.method ?? (opts.body === undefined ? 'GET' : 'POST'),
    credentials: 'same-origin',
    headers: opts.body === undefined || isForm ? { Accept: 'application/json' } : { 'Content-Type': 'application/json', Accept: 'application/json' },
    body: opts.body === undefined ? undefined : isForm ? (opts.body as FormData) : JSON.stringify(opts.body),
    signal: opts.signal,
  });
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  let data: unknown = undefined;
  try {
    data = text ? JSON.parse(text) : undefined;
  } catch {
    data = undefined;
  }
  if (!res.ok) {
    const err = (data as Partial<ApiError> | undefined)?.error;
    throw new ApiRequestError(res.status, err?.code ?? 'http_error', err?.message ?? `The server answered ${res.status}.`, err?.details);
  }
  return data as T;
}

export const queryString = (params: Record<string, string | number | boolean | undefined | null>) => {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null && v !== '') q.set(k, String(v));
  const s = q.toString();
  return s ? `?${s}` : '';
};
