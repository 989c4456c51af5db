/** Calls to the veer API with the bearer token; failures become ApiError with the server's code and issues. */
import { printableJson } from '../../contract/free-text.ts';
import type { Session } from './session.ts';

export interface FieldIssue { path: string; message: string }

export class ApiError extends Error {
  override readonly name = 'ApiError';
  constructor(readonly status: number, readonly code: string, message: string, readonly issues: FieldIssue[] = []) {
    super(message);
  }
}

/** Called when the server answers 401 (token revoked or unknown): the app signs out. */
let onUnauthorised: () => void = () => {};
export function setUnauthorisedHandler(handler: () => void): void { onUnauthorised = handler; }

async function toError(res: Response): Promise<ApiError> {
  let body: { error?: { code?: string; message?: string; issues?: FieldIssue[] } } = {};
  try { body = printableJson(await res.json() as typeof body); } catch { /* not JSON */ }
  const e = body.error ?? {};
  return new ApiError(res.status, e.code ?? `HTTP_${res.status}`, e.message ?? res.statusText, e.issues ?? []);
}

export async function api<T>(session: Pick<Session, 'token'>, method: string, path: string, body?: unknown): Promise<T> {
  const headers: Record<string, string> = { authorization: `Bearer ${session.token}`, accept: 'application/json' };
  if (body !== undefined) headers['content-type'] = 'application/json';
  const res = await fetch(path, { method, headers, ...(body !== undefined ? { body: JSON.stringify(body) } : {}) });
  if (!res.ok) {
    const error = await toError(res);
    if (res.status === 401) onUnauthorised();
    throw error;
  }
  // Server text is shown on screen: control and bidirectional-override characters become visible escapes.
  return printableJson(await res.json() as T);
}

/** Fetches a file with the token and hands it to the browser as a download. */
export async function download(session: Pick<Session, 'token'>, path: string, fallbackName: string): Promise<string> {
  const res = await fetch(path, { headers: { authorization: `Bearer ${session.token}` } });
  if (!res.ok) throw await toError(res);
  const disposition = res.headers.get('content-disposition') ?? '';
  const name = /filename="([^"]+)"/.exec(disposition)?.[1] ?? fallbackName;
  const url = URL.createObjectURL(await res.blob());
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
  return name;
}
