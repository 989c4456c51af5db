/** Boots the console: hash routes → screens inside the frame. */
import './styles.css';
import { setUnauthorisedHandler } from './api-client.ts';
import type { Screen, ScreenContext, ScreenFactory } from './app-context.ts';
import { h } from './dom.ts';
import { renderFrame } from './layout.ts';
import { clearSession, loadSession, saveSession, type Session } from './session.ts';
import { budgetScreen, budgetSubmitScreen } from './screens/budget.ts';
import { historyScreen } from './screens/history.ts';
import { jobsScreen } from './screens/jobs.ts';
import { planReviewScreen } from './screens/plan-review.ts';
import { plansScreen } from './screens/plans.ts';
import { signInScreen } from './screens/sign-in.ts';
import { submitScreen } from './screens/submit.ts';

const ROUTES: { pattern: RegExp; keys: string[]; screen: ScreenFactory; open?: boolean }[] = [
  { pattern: /^#\/sign-in$/, keys: [], screen: signInScreen, open: true },
  { pattern: /^#\/submit$/, keys: [], screen: submitScreen },
  { pattern: /^#\/jobs$/, keys: [], screen: jobsScreen },
  { pattern: /^#\/jobs\/([^/]+)$/, keys: ['jobId'], screen: jobsScreen },
  { pattern: /^#\/plans$/, keys: [], screen: plansScreen },
  { pattern: /^#\/plans\/([^/]+)$/, keys: ['planId'], screen: planReviewScreen },
  { pattern: /^#\/plans\/([^/]+)\/history$/, keys: ['planId'], screen: historyScreen },
  { pattern: /^#\/budgets$/, keys: [], screen: budgetSubmitScreen },
  { pattern: /^#\/budgets\/([^/]+)$/, keys: ['jobId'], screen: budgetScreen },
];

const root = document.getElementById('app') as HTMLElement;
let session: Session | null = loadSession();
let current: Screen | null = null;

function navigate(hash: string): void {
  if (location.hash === hash) render();
  else location.hash = hash;
}

function signOut(): void {
  clearSession();
  session = null;
  navigate('#/sign-in');
}

setUnauthorisedHandler(() => { if (session) signOut(); });

function render(): void {
  current?.dispose?.();
  current = null;
  const hash = location.hash || '#/';
  if (hash === '#/' || hash === '#') { navigate(session ? '#/jobs' : '#/sign-in'); return; }
  const route = ROUTES.find((r) => r.pattern.test(hash));
  if (!route) {
    root.replaceChildren(renderFrame(session, hash, signOut, h('section', {}, h('h1', { tabindex: '-1' }, 'Not found'), h('p', {}, h('a', { href: '#/' }, 'Go to the start')))));
    return;
  }
  if (!route.open && !session) { navigate('#/sign-in'); return; }
  const match = route.pattern.exec(hash) as RegExpExecArray;
  const params: Record<string, string> = {};
  route.keys.forEach((k, i) => { params[k] = decodeURIComponent(match[i + 1]); });
  const ctx: ScreenContext = {
    session, params, navigate,
    signIn(s) { saveSession(s); session = s; navigate('#/jobs'); },
    signOut,
  };
  current = route.screen(ctx);
  document.title = `${current.title} · veer`;
  root.replaceChildren(renderFrame(session, hash, signOut, current.node));
  const heading = root.querySelector('main h1') as HTMLElement | null;
  heading?.focus({ preventScroll: true });
}

window.addEventListener('hashchange', render);
render();
