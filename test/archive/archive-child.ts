/**
 * Child process for the concurrency tests (real processes, real database):
 *  - `append <location> <processIndex> <count>`: records `count` jobs (submission + plan each); plans share a few
 *    target-set keys across processes so supersession races too. Prints `{planIds, startedAt, endedAt}` (ms since 1970) as one JSON line.
 *  - `review <location> <planId> <reviewer> <startAtMs>`: waits until the given wall-clock time (so the processes
 *    start together), records an approval, prints `{"ok":true}` or `{"error":"<name>"}`.
 * Usage: node --import tsx archive-child.ts <mode> ...
 */
import { makePlan, PROBLEM } from './fixtures.ts';
import { openLocation } from './store-handles.ts';

const [mode, location, ...rest] = process.argv.slice(2);
const archive = await openLocation(location);
try {
  if (mode === 'append') {
    const [indexText, countText] = rest;
    const planIds: string[] = [];
    const startedAt = Date.now();
    for (let i = 0; i < Number(countText); i += 1) {
      const jobId = `job-p${indexText}-${i}`;
      await archive.recordJobSubmitted({ jobId, actor: `submitter-${indexText}`, problem: { ...PROBLEM, i } });
      const result = await archive.recordPlanProposed({ jobId, actor: `worker-${indexText}`, submittedBy: `submitter-${indexText}`,
        plan: makePlan({ targetSetKey: `key-${i % 3}` }) });
      planIds.push(result.planId);
    }
    process.stdout.write(JSON.stringify({ planIds, startedAt, endedAt: Date.now() }) + '\n');
  } else if (mode === 'review') {
    const [planId, reviewer, startAt] = rest;
    await new Promise((r) => setTimeout(r, Math.max(0, Number(startAt) - Date.now())));
    try {
      await archive.recordReview({ planId, reviewer, decision: 'approve', comment: '', acknowledgedCaveatCodes: [] });
      process.stdout.write('{"ok":true}\n');
    } catch (error) {
      process.stdout.write(JSON.stringify({ error: (error as Error).name }) + '\n');
    }
  } else {
    throw new Error(`unknown mode ${mode}`);
  }
} finally {
  await archive.close();
}
