import type { z } from 'zod';
import { ApiErrorBodySchema, type ErrorCode } from '@shared/contracts/errors';

/** An error answer from the API (or a network failure, status 0), with the server's field errors. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode | 'network',
    message: string,
    readonly fieldErrors: Record<string, string[]> = {},
    readonly requestId?: string,
  ) {
    super(message);
    this.name = 'ApiError';
  }
  get isClientError(): boolean {
    return this.status >= 400 && this.status < 500;
  }
}

export function isApiError(err: unknown): err is ApiError {
  return err instanceof ApiError;
}

type Params = Record<string, string | number | boolean | null | undefined | Array<string | number>>;
export interface RequestOptions {
  params?: Params;
  signal?: AbortSignal;
  headers?: Record<string, string>;
}

// The session's CSRF token; the auth feature hands it over whenever session info arrives.
let csrfToken = '';
export function setCsrfToken(token: string): void {
  csrfToken = token;
}

type Listener = () => void;
const contactListeners = new Set<Listener>();
/** Called after every answered request except background polls: each one extends the server's idle time. */
export function onServerContact(listener: Listener): () => void {
  contactListeners.add(listener);
  return () => contactListeners.delete(listener);
}

function withParams(url: string, params?: Params): string {
  if (!params) return url;
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value === undefined || value === null || value === '') continue;
    if (Array.isArray(value)) value.forEach((v) => search.append(key, String(v)));
    else search.set(key, String(value));
  }
  const qs = search.toString();
  return qs ? `${url}${url.includes('?') ? '&' : '?'}${qs}` : url;
}

async function readSessionToken(): Promise<string> {
  const res = await fetch('/api/auth/session', { credentials: 'same-origin', headers: { Accept: 'application/json' } });
  const body = (await res.json().catch(() => ({}))) as { csrfToken?: unknown };
  if (typeof body.csrfToken === 'string') csrfToken = body.csrfToken;
  return csrfToken;
}

async function ensureCsrfToken(): Promise<string> {
  return csrfToken || readSessionToken();
}

async function toApiError(res: Response): Promise<ApiError> {
  const body = await res.json().catch(() => undefined);
  const parsed = ApiErrorBodySchema.safeParse(body);
  if (parsed.success) {
    const e = parsed.data.error;
    return new ApiError(res.status, e.code, e.message, e.fieldErrors ?? {}, e.requestId);
  }
  const code: ErrorCode = res.status === 401 ? 'unauthenticated' : res.status === 404 ? 'not_found' : res.status >= 500 ? 'internal' : 'validation_failed';
  return new ApiError(res.status, code, res.status >= 500 ? 'The server could not finish that. Try again in a moment.' : `The request failed (${res.status}).`);
}

async function send<S extends z.ZodType>(method: string, url: string, schema: S | null, body: unknown, options: RequestOptions = {}, isRetry = false): Promise<z.infer<S>> {
  const headers: Record<string, string> = { Accept: 'application/json', ...options.headers };
  const isWrite = method !== 'GET';
  if (isWrite) headers['X-CSRF-Token'] = await ensureCsrfToken();
  let payload: BodyInit | undefined;
  if (body instanceof FormData) payload = body; // the browser sets the multipart boundary
  else if (body !== undefined) {
    headers['Content-Type'] = 'application/json';
    payload = JSON.stringify(body);
  }
  let res: Response;
  try {
    res = await fetch(withParams(url, options.params), { method, headers, body: payload, credentials: 'same-origin', signal: options.signal });
  } catch (err) {
    if (err instanceof DOMException && err.name === 'AbortError') throw err;
    throw new ApiError(0, 'network', 'Could not reach Crumbtrail. Check the connection and try again.');
  }
  // Background polling does not extend the server's idle time, so it must not move the idle warning either.
  if (headers['X-Background-Refresh'] !== '1') contactListeners.forEach((l) => l());
  if (res.status === 403 && isWrite && !isRetry) {
    // A write refused as forbidden may just carry a stale CSRF token (the session ended or was
    // reissued): if the session now has another token, retry once. An ended session then answers 401.
    const sent = headers['X-CSRF-Token'];
    const error = await toApiError(res);
    const now = await readSessionToken().catch(() => undefined);
    if (now && now !== sent) return send(method, url, schema, body, options, true);
    throw error;
  }
  if (!res.ok) throw await toApiError(res);
  if (res.status === 204 || schema === null) return undefined as z.infer<S>;
  const json: unknown = await res.json().catch(() => undefined);
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    console.error(`Unexpected response from ${method} ${url}`, parsed.error.issues);
    throw new ApiError(res.status, 'internal', 'The server answered in a way this page does not understand. Reload the page.');
  }
  return parsed.data;
}

/** POST JSON and answer the body as a Blob (PDF downloads), with the CSRF header and the same error answers. */
async function postForBlob(url: string, body: unknown): Promise<{ blob: Blob; headers: Headers }> {
  const headers = { Accept: 'application/pdf, application/json', 'Content-Type': 'application/json', 'X-CSRF-Token': await ensureCsrfToken() };
  let res: Response;
  try {
    res = await fetch(url, { method: 'POST', headers, body: JSON.stringify(body), credentials: 'same-origin' });
  } catch {
    throw new ApiError(0, 'network', 'Could not reach Crumbtrail. Check the connection and try again.');
  }
  contactListeners.forEach((l) => l());
  if (!res.ok) throw await toApiError(res);
  return { blob: await res.blob(), headers: res.headers };
}

/**
 * POST JSON and read a long download (the audit packet zip) as it streams, reporting the bytes
 * received so far; the answer has no Content-Length, so progress is bytes, not a percentage.
 */
async function postForDownload(url: string, body: unknown, onBytes: (received: number) => void, signal?: AbortSignal): Promise<{ blob: Blob; headers: Headers }> {
  const headers = { Accept: 'application/zip, application/json', 'Content-Type': 'application/json', 'X-CSRF-Token': await ensureCsrfToken() };
  let res: Response;
  try {
    res = await fetch(url, { method: 'POST', headers, body: JSON.stringify(body), credentials: 'same-origin', signal });
  } catch (err) {
    if (err instanceof DOMException && err.name === 'AbortError') throw err;
    throw new ApiError(0, 'network', 'Could not reach Crumbtrail. Check the connection and try again.');
  }
  contactListeners.forEach((l) => l());
  if (!res.ok) throw await toApiError(res);
  if (!res.body) return { blob: await res.blob(), headers: res.headers };
  const reader = res.body.getReader();
  const chunks: Uint8Array<ArrayBuffer>[] = [];
  let received = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks.push(value);
      received += value.byteLength;
      onBytes(received);
    }
  } catch (err) {
    if (err instanceof DOMException && err.name === 'AbortError') throw err;
    throw new ApiError(0, 'network', 'The download stopped before it was complete. Try again.');
  }
  return { blob: new Blob(chunks, { type: res.headers.get('Content-Type') ?? 'application/octet-stream' }), headers: res.headers };
}

/**
 * The only fetch in the client. Every response is validated with its zod schema; pass `null` as the
 * schema for 204 answers. Writes carry the session's X-CSRF-Token.
 */
export const api = {
  get: <S extends z.ZodType>(url: string, schema: S, options?: RequestOptions) => send('GET', url, schema, undefined, options),
  post: <S extends z.ZodType>(url: string, schema: S | null, body?: unknown, options?: RequestOptions) => send('POST', url, schema, body, options),
  put: <S extends z.ZodType>(url: string, schema: S | null, body?: unknown, options?: RequestOptions) => send('PUT', url, schema, body, options),
  patch: <S extends z.ZodType>(url: string, schema: S | null, body?: unknown, options?: RequestOptions) => send('PATCH', url, schema, body, options),
  delete: <S extends z.ZodType>(url: string, schema: S | null, body?: unknown, options?: RequestOptions) => send('DELETE', url, schema, body, options),
  /** multipart/form-data upload (POST), with the CSRF header like every write. */
  upload: <S extends z.ZodType>(url: string, schema: S | null, form: FormData, options?: RequestOptions) => send('POST', url, schema, form, options),
  /** POST that answers a file (e.g. a label PDF) as a Blob. */
  postForBlob,
  /** POST that streams a long file back, with progress in bytes. */
  postForDownload,
};
