/** The frame around every screen: top bar, navigation, the standing review notice, and the main region. */
import { h, svg } from './dom.ts';
import { hasRole, type Session } from './session.ts';

/** Shown on every screen (the API's REVIEW_NOTICE says the same). */
export const PROPOSAL_NOTICE = 'Plans shown here are PROPOSALS only. Every plan must be reviewed and approved by qualified flight-dynamics '
  + 'staff and verified independently, following the mission\'s own procedures, before anything is commanded.';

interface NavItem { hash: string; label: string; roles: string[] }
const NAV: NavItem[] = [
  { hash: '#/submit', label: 'New job', roles: ['submitter'] },
  { hash: '#/jobs', label: 'Jobs', roles: ['submitter', 'reviewer', 'auditor'] },
  { hash: '#/plans', label: 'Plans', roles: ['submitter', 'reviewer', 'auditor'] },
  { hash: '#/budgets', label: 'Δv budget', roles: ['submitter'] },
];

export function renderFrame(session: Session | null, currentHash: string, onSignOut: () => void, content: Node): HTMLElement {
  const nav = session ? h('nav', { 'aria-label': 'Screens' },
    h('ul', {}, NAV.filter((n) => hasRole(session, ...n.roles)).map((n) => {
      const current = currentHash === n.hash || currentHash.startsWith(`${n.hash}/`);
      return h('li', {}, h('a', { href: n.hash, ...(current ? { 'aria-current': 'page' } : {}) }, n.label));
    }))) : null;
  const who = session ? h('div', { class: 'who' },
    h('span', { class: 'who-name', 'data-testid': 'identity' }, session.name),
    h('span', { class: 'who-roles' }, session.roles.join(' · ')),
    h('button', { type: 'button', class: 'quiet', onclick: onSignOut }, 'Sign out')) : null;
  return h('div', { class: 'frame' },
    // Hash routes own location.hash, so the skip link moves focus itself instead of navigating to #main.
    h('a', { class: 'skip', href: '#main', onclick: (e: Event) => { e.preventDefault(); document.getElementById('main')?.focus(); } }, 'Skip to content'),
    h('header', { class: 'topbar' },
      h('div', { class: 'brand' }, svg('svg', { class: 'brand-mark', viewBox: '0 0 24 24', 'aria-hidden': 'true' }, svg('path', { d: 'M3 20 C 9 15, 11 8, 21 4' }), svg('circle', { cx: 12, cy: 13, r: 3 })), h('span', {}, 'veer'), h('span', { class: 'brand-sub' }, 'manoeuvre proposals')),
      nav, who),
    h('p', { class: 'notice', role: 'note', 'data-testid': 'proposal-notice' }, h('strong', {}, 'Proposal only. '), PROPOSAL_NOTICE.replace(/^Plans shown here are PROPOSALS only\. /, '')),
    h('main', { id: 'main', tabindex: '-1' }, content),
    h('footer', { class: 'footer' }, PROPOSAL_NOTICE));
}
