/**
 * The signed-in identity. The bearer token lives in sessionStorage (per tab, gone when the tab closes) and
 * is sent on every API call; the name and roles come from GET /console/session.
 */
import type { Identity } from './plan-types.ts';

const KEY = 'veer.console.session';

export interface Session extends Identity { token: string }

export function loadSession(): Session | null {
  try {
    const raw = sessionStorage.getItem(KEY);
    if (!raw) return null;
    const s = JSON.parse(raw) as Session;
    return typeof s.token === 'string' && typeof s.name === 'string' && Array.isArray(s.roles) ? s : null;
  } catch {
    return null;
  }
}

export function saveSession(session: Session): void {
  sessionStorage.setItem(KEY, JSON.stringify(session));
}

export function clearSession(): void {
  sessionStorage.removeItem(KEY);
}

export function hasRole(session: Session | null, ...roles: string[]): boolean {
  return session !== null && session.roles.some((r) => roles.includes(r));
}
