import type { z } from 'zod';

/** An API failure with the server's `{ error: { code, message } }` answer. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

/**
 * Every state-changing request carries this header. Browsers cannot add a custom header to a
 * cross-site request without a CORS preflight the server never grants, so its presence proves
 * the request came from our own pages (CSRF defence; see server/http/csrf.ts).
 */
export const CSRF_HEADER = 'x-shockwright-request';

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

async function request<T>(method: Method, url: string, body?: unknown, schema?: z.ZodType<T>): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (method !== 'GET') headers[CSRF_HEADER] = '1';
  let payload: BodyInit | undefined;
  if (body instanceof FormData) payload = body;
  else if (body !== undefined) {
    headers['content-type'] = 'application/json';
    payload = JSON.stringify(body);
  }
  let res: Response;
  try {
    res = await fetch(url, { method, headers, body: payload, credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'The server could not be reached. Check your connection and try again.');
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  let data: unknown;
  try {
    data = text ? JSON.parse(text) : undefined;
  } catch {
    data = undefined;
  }
  if (!res.ok) {
    const err = (data as { error?: { code?: string; message?: string; details?: unknown } } | undefined)?.error;
    throw new ApiError(res.status, err?.code ?? 'http_error', err?.message ?? `The server answered ${res.status}.`, err?.details);
  }
  return schema ? schema.parse(data) : (data as T);
}

/** The one typed fetch wrapper. Pass a zod schema from shared/ to check what comes back. */
export const api = {
  get: <T>(url: string, schema?: z.ZodType<T>) => request<T>('GET', url, undefined, schema),
  post: <T>(url: string, body?: unknown, schema?: z.ZodType<T>) => request<T>('POST', url, body ?? {}, schema),
  put: <T>(url: string, body?: unknown, schema?: z.ZodType<T>) => request<T>('PUT', url, body ?? {}, schema),
  patch: <T>(url: string, body?: unknown, schema?: z.ZodType<T>) => request<T>('PATCH', url, body ?? {}, schema),
  delete: <T>(url: string, schema?: z.ZodType<T>) => request<T>('DELETE', url, undefined, schema),
};
