/**
 * Shared by `veer review|history|export|verify`: the server address and token (--url/--token or
 * VEER_URL/VEER_TOKEN) and a small JSON-over-HTTP call that turns API errors into readable messages.
 */
import type { ParseArgsConfig } from 'node:util';
import { InvalidInputError } from '../../contract/errors.ts';
import { printableJson, printableText } from '../../contract/free-text.ts';

/** Options every remote command accepts (for util.parseArgs). */
export const REMOTE_OPTIONS = {
  url: { type: 'string' },
  token: { type: 'string' },
  json: { type: 'boolean', default: false },
} as const satisfies NonNullable<ParseArgsConfig['options']>;

export const REMOTE_USAGE = `  --url URL      API address (default: $VEER_URL, else http://127.0.0.1:8080)
  --token TOKEN  bearer token (default: $VEER_TOKEN)
  --json         print the server's JSON answer instead of the readable report`;

export const PROPOSAL_NOTICE = 'PROPOSAL ONLY: plans require review and approval by qualified flight-dynamics staff and independent '
  + 'verification, and are handled under the mission\'s own procedures before anything is commanded.';

/** A bad command line (exit code 2): the contract's field error, under a name saying where it came from. */
export class UsageError extends InvalidInputError {}

/** An error answer from the API, with its status and JSON error body. */
export class ApiCallError extends Error {
  override readonly name = 'ApiCallError';
  constructor(readonly status: number, readonly body: { error?: { code?: string; message?: string; missing?: string[]; unknown?: string[]; issues?: Array<{ path: string; message: string }> } }) {
    const e = body?.error;
    const issues = e?.issues?.map((i) => `\n  ${i.path}: ${i.message}`).join('') ?? '';
    super(`HTTP ${status} ${e?.code ?? ''}: ${e?.message ?? 'request failed'}${issues}`);
  }
}

export interface Remote { url: string; token: string | undefined }

/** Resolves --url/--token against the environment. */
export function remoteFrom(values: { url?: string; token?: string }): Remote {
  const url = (values.url ?? process.env.VEER_URL ?? 'http://127.0.0.1:8080').replace(/\/+$/, '');
  try { new URL(url); } catch { throw new UsageError('--url', `not a URL: ${url}`); }
  return { url, token: values.token ?? process.env.VEER_TOKEN };
}

/** Sends a request to the API with the bearer token (if any); rejects with "cannot reach URL" when nothing answers. */
export async function sendToApi(remote: Remote, path: string, init: Omit<RequestInit, 'headers'> & { headers: Record<string, string> }): Promise<Response> {
  const headers = { ...init.headers };
  if (remote.token) headers.authorization = `Bearer ${remote.token}`;
  try {
    return await fetch(remote.url + path, { ...init, headers });
  } catch (error) {
    throw new Error(`cannot reach ${remote.url}: ${(error as Error).message}`);
  }
}

/**
 * An answer's body as JSON, or (not JSON) an error body carrying the first 200 characters of its text. Every
 * string is made printable (control characters shown as `\u{1b}` escapes): server text must never drive the
 * user's terminal.
 */
export function parseAnswer(text: string): unknown {
  try { return printableJson(JSON.parse(text) as unknown); } catch { return { error: { message: printableText(text.slice(0, 200)) } }; }
}

/** Calls the API; resolves to the parsed JSON body of a 2xx answer, rejects with ApiCallError otherwise. */
export async function callApi<T>(remote: Remote, method: string, path: string, body?: unknown): Promise<T> {
  const headers: Record<string, string> = { accept: 'application/json' };
  if (body !== undefined) headers['content-type'] = 'application/json';
  const res = await sendToApi(remote, path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
  const parsed = parseAnswer(await res.text());
  if (!res.ok) throw new ApiCallError(res.status, parsed as ApiCallError['body']);
  return parsed as T;
}

/**
 * The catch of a remote command: rethrows anything that is not an API answer; otherwise prints
 * `veer <command>: <message>` on stderr and returns the exit code (see exitCodeFor).
 */
export function reportApiError(command: string, error: unknown): number {
  if (!(error instanceof ApiCallError)) throw error;
  process.stderr.write(`veer ${command}: ${error.message}\n`);
  return exitCodeFor(error);
}

/** Exit code for an API error: 2 for a refused request the user can fix (4xx), 1 otherwise. */
export function exitCodeFor(error: unknown): number {
  return error instanceof ApiCallError && error.status >= 400 && error.status < 500 ? 2 : 1;
}
