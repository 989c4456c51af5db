/** Plans: the proposed, approved, rejected and superseded plans, newest first, with a state filter. */
import { api } from '../api-client.ts';
import type { ScreenFactory } from '../app-context.ts';
import { h, replaceChildren, scrollingTable } from '../dom.ts';
import { isoShort } from '../format.ts';
import type { PlanSummary } from '../plan-types.ts';

export function planStateBadge(state: string): HTMLElement {
  return h('span', { class: `badge plan-${state}`, 'data-testid': 'plan-state' }, state);
}

export const plansScreen: ScreenFactory = (ctx) => {
  const session = ctx.session!;
  const body = h('tbody');
  const note = h('p', { class: 'help', 'aria-live': 'polite' });
  const filter = h('select', { id: 'plan-filter' },
    ['all', 'proposed', 'approved', 'rejected', 'superseded'].map((s) => h('option', { value: s }, s)));
  const load = async (): Promise<void> => {
    const q = filter.value === 'all' ? '' : `&state=${filter.value}`;
    try {
      const { plans } = await api<{ plans: PlanSummary[] }>(session, 'GET', `/v1/plans?limit=100${q}`);
      replaceChildren(body, plans.length === 0 ? h('tr', {}, h('td', { colspan: 6 }, 'No plans.')) : plans.map((p) => h('tr', {},
        h('td', {}, h('a', { href: `#/plans/${encodeURIComponent(p.planId)}` }, p.spacecraftName), h('div', { class: 'mono small' }, p.planId)),
        h('td', {}, planStateBadge(p.state)),
        h('td', {}, p.converged ? 'converged' : h('span', { class: 'warn' }, 'not converged')),
        h('td', {}, p.crossCheckPassed ? 'passed' : h('span', { class: 'warn' }, 'failed')),
        h('td', {}, p.submittedBy, p.submittedBy === session.name ? ' (you)' : ''),
        h('td', { class: 'small' }, isoShort(p.proposedAt)))));
      note.textContent = `${plans.length} plan${plans.length === 1 ? '' : 's'}`;
    } catch (error) {
      note.textContent = `Could not list plans: ${(error as Error).message}`;
    }
  };
  filter.addEventListener('change', () => { void load(); });
  void load();
  return {
    title: 'Plans',
    node: h('section', {},
      h('h1', { tabindex: '-1' }, 'Plans'),
      h('div', { class: 'card' },
        h('div', { class: 'field inline' }, h('label', { for: 'plan-filter' }, 'Show'), filter),
        scrollingTable('Plans', h('table', { class: 'data' },
          h('caption', { class: 'sr-only' }, 'Plans, newest first'),
          h('thead', {}, h('tr', {}, ['Spacecraft', 'State', 'Corrector', 'Cross-check', 'Submitted by', 'Proposed'].map((c) => h('th', { scope: 'col' }, c)))),
          body)),
        note)),
  };
};
