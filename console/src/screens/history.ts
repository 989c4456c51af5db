/**
 * History of a plan: its archive entries (and its job's), each hash checked by the server and again in this
 * browser (own hash and adjacent links only — not a chain verification), the plan's state, the export bundle
 * download, and (auditors) a check of the whole chain.
 */
import { ApiError, api, download } from '../api-client.ts';
import type { ScreenFactory } from '../app-context.ts';
import { checkEntries } from '../chain-check.ts';
import { h, replaceChildren, scrollingTable } from '../dom.ts';
import { isoShort } from '../format.ts';
import type { HistoryEntry, PlanRecord } from '../plan-types.ts';
import { hasRole } from '../session.ts';
import { planStateBadge } from './plans.ts';

function describe(e: HistoryEntry): string {
  const p = e.payload as Record<string, unknown>;
  switch (e.kind) {
    case 'review': return `${String(p.decision ?? 'decision')}${p.comment ? ` — “${String(p.comment)}”` : ''}`;
    case 'job-submitted': return p.reason ? `reason: ${String(p.reason)}` : 'job submitted';
    case 'plan-proposed': return 'plan proposed by the planner';
    case 'plan-superseded': return p.supersededBy ? `superseded by ${String(p.supersededBy)}` : 'superseded';
    default: return '';
  }
}

export const historyScreen: ScreenFactory = (ctx) => {
  const session = ctx.session!;
  const planId = ctx.params.planId;
  const body = h('div', {}, h('p', {}, 'Loading the history…'));
  const load = async (): Promise<void> => {
    try {
      const { plan, entries } = await api<{ plan: PlanRecord; entries: HistoryEntry[] }>(session, 'GET', `/v1/plans/${encodeURIComponent(planId)}/history`);
      const local = await checkEntries(entries);
      const serverOk = entries.every((e) => e.hashMatches);
      const localOk = local ? local.every((c) => c.hashOk && c.linkOk !== false) : null;
      const links = local ? local.filter((c) => c.linkOk !== null).length : 0;
      // Only these entries' own hashes and their links to each other are checked here: an entry rewritten with a
      // recomputed hash (and its successors) would still match, so this is not a verification of the chain.
      const matching = serverOk && localOk !== false;
      const status = h('p', { class: `card verify ${matching ? 'verify-ok' : 'verify-bad'}`, role: 'status', 'data-testid': 'history-verified' },
        h('strong', {}, matching ? 'Entries match their hashes. ' : 'MISMATCH: an entry does not match its hash. '),
        `${entries.length} entries: the server re-hashed ${entries.filter((e) => e.hashMatches).length} of ${entries.length} as matching`,
        local ? `; this browser re-hashed ${local.filter((c) => c.hashOk).length} of ${entries.length} as matching and checked ${links} link${links === 1 ? '' : 's'} between adjacent entries.`
          : '; this browser cannot re-hash (WebCrypto needs HTTPS or localhost).',
        ' The whole chain is not checked here — ask an auditor to verify the archive (veer verify, or the button below).');
      const checkOf = new Map((local ?? []).map((c) => [c.sequence, c]));
      const exportButton = h('button', { type: 'button', class: 'primary', 'data-testid': 'export' }, 'Download the export bundle');
      const exportNote = h('p', { class: 'help', 'aria-live': 'polite' });
      exportButton.addEventListener('click', () => {
        exportButton.disabled = true;
        download(session, `/v1/plans/${encodeURIComponent(planId)}/export`, `${planId}-bundle.json`)
          .then((name) => { exportNote.textContent = `Saved ${name}. Check it offline with: veer verify --bundle ${name}`; })
          .catch((e: unknown) => { exportNote.textContent = `Export failed: ${(e as Error).message}`; })
          .finally(() => { exportButton.disabled = false; });
      });
      const chainButton = h('button', { type: 'button', class: 'quiet' }, 'Verify the whole archive chain');
      const chainNote = h('p', { class: 'help', 'aria-live': 'polite' });
      chainButton.addEventListener('click', () => {
        chainNote.textContent = 'Checking…';
        api<{ ok: boolean; entriesChecked: number; firstFailure: { sequence: number; message: string } | null; projectionMismatches: unknown[] }>(session, 'GET', '/v1/archive/verify')
          .then((r) => { chainNote.textContent = r.ok ? `Whole chain verified: ${r.entriesChecked} entries, no projection mismatches.` : `Chain check FAILED at entry ${r.firstFailure?.sequence ?? '?'}: ${r.firstFailure?.message ?? `${r.projectionMismatches.length} projection mismatches`}`; })
          .catch((e: unknown) => { chainNote.textContent = e instanceof ApiError ? e.message : String(e); });
      });
      replaceChildren(body,
        h('section', { class: 'card' },
          h('dl', { class: 'meta cols' },
            h('dt', {}, 'Plan'), h('dd', { class: 'mono' }, h('a', { href: `#/plans/${encodeURIComponent(planId)}` }, plan.planId)),
            h('dt', {}, 'State'), h('dd', {}, planStateBadge(plan.state)),
            h('dt', {}, 'Spacecraft'), h('dd', {}, plan.spacecraftName),
            h('dt', {}, 'Submitted by'), h('dd', {}, plan.submittedBy),
            h('dt', {}, 'Decided'), h('dd', {}, plan.decidedBy ? `${plan.decidedBy}, ${isoShort(plan.decidedAt)}` : '—'),
            h('dt', {}, 'Superseded by'), h('dd', {}, plan.supersededBy ?? '—'))),
        status,
        h('section', { class: 'card' },
          scrollingTable('Archive entries', h('table', { class: 'data', 'data-testid': 'history-table' },
            h('caption', {}, 'Archive entries about this plan and its job, oldest first'),
            h('thead', {}, h('tr', {}, ['#', 'When (UTC)', 'Who', 'What', 'Detail', 'Hash', 'Server check', 'Browser check'].map((c) => h('th', { scope: 'col' }, c)))),
            h('tbody', {}, entries.map((e) => {
              const c = checkOf.get(e.sequence);
              return h('tr', {},
                h('td', { class: 'num' }, e.sequence), h('td', { class: 'small' }, isoShort(e.at)), h('td', {}, e.actor),
                h('td', {}, e.kind), h('td', {}, describe(e)),
                h('td', { class: 'mono small', title: e.hash }, `${e.hash.slice(0, 12)}…`),
                h('td', {}, e.hashMatches ? h('span', { class: 'ok' }, '✓ matches') : h('span', { class: 'bad' }, '✗ differs')),
                h('td', {}, !c ? '—' : c.hashOk ? h('span', { class: 'ok' }, c.linkOk ? '✓ matches, linked' : '✓ matches') : h('span', { class: 'bad' }, '✗ differs')));
            }))))),
        h('section', { class: 'card' },
          h('h2', {}, 'Export and checks'),
          hasRole(session, 'reviewer', 'auditor') ? [exportButton, exportNote] : h('p', {}, 'Exports need the reviewer or auditor role.'),
          hasRole(session, 'auditor') ? [chainButton, chainNote] : null));
    } catch (error) {
      replaceChildren(body, h('p', { class: 'error', role: 'alert' }, `Could not load the history of ${planId}: ${(error as Error).message}`));
    }
  };
  void load();
  return { title: 'History', node: h('section', {}, h('h1', { tabindex: '-1' }, 'Plan history'), body) };
};
