/**
 * `veer verify`: check the archive's hash chain — through the API (auditor), directly on a local store
 * (--data-dir / --database-url), or offline on an exported bundle (--bundle FILE).
 */
import { readFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import {
  ArchiveNotFoundError, BUNDLE_HEAD_ADVICE, checkPlanBundle, verifyPostgresReadOnly, verifySqliteReadOnly, type PlanBundle, type VerifyReport,
} from '../../archive/index.ts';
import { expectedHeadSchema } from '../../contract/review-schemas.ts';
import type { ExpectedHead } from '../../contract/archive-types.ts';
import type { CliCommand } from '../command.ts';
import { callApi, reportApiError, REMOTE_OPTIONS, REMOTE_USAGE, remoteFrom, UsageError } from './remote-api.ts';

const USAGE = `usage: veer verify [--url URL] [--token TOKEN]          through the API (auditor role)
       veer verify --data-dir DIR | --database-url URL   directly on a store, read-only (never created or migrated)
       veer verify --bundle FILE                         offline, on a bundle from veer export
       [--expect-head SEQ:HASH] [--json]

Walks the whole chain (each entry's hash over its canonical content, each link to the previous entry, the
recorded head) and names the first entry that does not match; also compares the plan-state table with what the
entries say. The text report always ends with the head (sequence and hash): record it outside the database.
--expect-head SEQ:HASH compares with a head recorded earlier: entry SEQ must still be in the chain with that
hash (newest entries cut, or cut and re-appended, fail). Exit codes: 0 sound; 1 a mismatch was found (or the
check failed); 2 bad usage.
${REMOTE_USAGE}`;

function reportText(r: VerifyReport): string {
  const lines = [r.ok ? `archive sound: ${r.entriesChecked} entries, head ${r.head.sequence} ${r.head.hash}` : 'ARCHIVE CHECK FAILED'];
  if (r.firstFailure) {
    const f = r.firstFailure;
    lines.push(f.likelyEditedSequence !== undefined
      ? `  mismatch seen at entry ${f.sequence} (${f.reason}); most likely edited: entry ${f.likelyEditedSequence} — ${f.message}`
      : `  first entry that does not match: ${f.sequence} (${f.reason}) — ${f.message}`,
      f.likelyEditedSequence !== undefined
        ? `  entries 1..${f.likelyEditedSequence - 1} check out; entry ${f.likelyEditedSequence} hashes on its own but is not the entry ${f.sequence} was written after`
        : `  entries 1..${r.lastGoodSequence} check out (last good hash ${r.lastGoodHash})`);
  }
  for (const m of r.projectionMismatches) lines.push(`  plan ${m.planId}: ${m.field} stored ${JSON.stringify(m.stored)} but the entries say ${JSON.stringify(m.derived)}`);
  const e = r.expectedHead;
  if (e) {
    lines.push(e.matches ? `  recorded head ${e.sequence} ${e.hash}: still in the chain, unchanged`
      : e.found === null ? `  RECORDED HEAD MISSING: the chain ends before entry ${e.sequence} (entries were cut)`
        : `  RECORDED HEAD DIFFERS: entry ${e.sequence} now has hash ${e.found}, recorded ${e.hash} (entries were cut and re-appended, or rewritten)`);
  }
  if (!r.ok) lines.push(`  head the store records: ${r.head.sequence} ${r.head.hash}`);
  lines.push(`  checked in ${r.durationMs.toFixed(1)} ms`);
  return lines.join('\n') + '\n';
}

/** `--expect-head SEQ:HASH` checked with the API's own schema; UsageError naming the option otherwise. */
function parseExpectedHead(text: string | undefined): ExpectedHead | undefined {
  if (text === undefined) return undefined;
  const parsed = expectedHeadSchema.safeParse(text);
  if (!parsed.success) throw new UsageError('--expect-head', parsed.error.issues[0]?.message ?? 'must be SEQ:HASH');
  return parsed.data;
}

export const verifyCommand: CliCommand = {
  name: 'verify',
  usage: USAGE,
  async run(args) {
    const { values } = parseArgs({
      args, allowPositionals: false,
      options: {
        ...REMOTE_OPTIONS, 'data-dir': { type: 'string' }, 'database-url': { type: 'string' }, bundle: { type: 'string' },
        'expect-head': { type: 'string' },
      },
    });
    const expectHead = parseExpectedHead(values['expect-head']);
    const modes = [values.bundle, values['data-dir'] ?? values['database-url']].filter((v) => v !== undefined).length;
    if (modes > 1) throw new UsageError('--bundle', 'give either --bundle or a local store, not both');
    if (values.bundle) {
      if (expectHead) throw new UsageError('--expect-head', 'compare a recorded head with a live archive (API or local store), not a bundle');
      let bundle: PlanBundle;
      try { bundle = JSON.parse(await readFile(values.bundle, 'utf8')) as PlanBundle; } catch (error) {
        throw new UsageError('--bundle', `cannot read ${values.bundle} as JSON: ${(error as Error).message}`);
      }
      const check = checkPlanBundle(bundle);
      process.stdout.write(values.json ? JSON.stringify({ ...check, advice: BUNDLE_HEAD_ADVICE }, null, 2) + '\n'
        : check.ok ? `bundle sound: ${check.entriesChecked} entries, ${check.headersChecked} chain headers${check.reachesHead ? ', reaching the recorded head' : ''}\n`
          + `  head recorded in the bundle: entry ${check.head?.sequence} ${check.head?.hash}\n  note: ${BUNDLE_HEAD_ADVICE}\n`
          : `BUNDLE CHECK FAILED at entry ${check.firstFailure?.sequence ?? '?'} (${check.firstFailure?.reason}): ${check.firstFailure?.message}\n`);
      return check.ok ? 0 : 1;
    }
    let report: VerifyReport;
    if (values['data-dir'] !== undefined || values['database-url'] !== undefined) {
      if (values['data-dir'] !== undefined && values['database-url'] !== undefined) {
        throw new UsageError('--data-dir', 'give either --data-dir or --database-url, not both');
      }
      try {
        // Read-only: nothing is created or migrated, so a mistyped folder is an error, not a fresh "sound" archive.
        const options = expectHead ? { expectHead } : {};
        report = values['database-url'] !== undefined ? await verifyPostgresReadOnly(values['database-url'], options)
          : await verifySqliteReadOnly(values['data-dir']!, options);
      } catch (error) {
        if (!(error instanceof ArchiveNotFoundError)) throw error;
        process.stderr.write(`veer verify: ${error.message}\n`);
        return 2;
      }
    } else {
      try {
        const query = expectHead ? `?expectHead=${expectHead.sequence}:${expectHead.hash}` : '';
        report = await callApi<VerifyReport>(remoteFrom(values), 'GET', `/v1/archive/verify${query}`);
      } catch (error) {
        return reportApiError('verify', error);
      }
    }
    process.stdout.write(values.json ? JSON.stringify(report, null, 2) + '\n' : reportText(report));
    return report.ok ? 0 : 1;
  },
};
