/**
 * Free text at the door and on the way out. Control characters (C0/C1, e.g. ESC starting an ANSI/ECMA-48
 * sequence, CR) and Unicode bidirectional controls (Unicode Standard Annex #9) are refused with 400 naming
 * the field; a "required" comment needs a visible character. Text that reached Redis another way (here:
 * enqueued directly, bypassing the API) is printed by the CLI with visible escapes, never raw.
 * Real Redis and SQLite archive through test/harness/service.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import { startService, type TestService } from '../harness/service.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;
beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

const ESC = '\u001b';
/** Moves the cursor up one line and clears it: what an attacker would use to hide a caveat line. */
const REWRITE_LINE = `${ESC}[1A${ESC}[2K`;
const BIDI_OVERRIDE = '\u202E';
const ZERO_WIDTH_SPACE = '\u200B';

function expectRefused(res: { status: number; body: any; text: string }, path: string): void {
  expect(res.status, res.text).toBe(400);
  const paths = (res.body.error.issues ?? []).map((i: { path: string }) => i.path);
  expect(paths).toContain(path);
}

describe('free text at the door', () => {
  describe('when a submission carries control characters', () => {
    it.each([
      ['spacecraft name with ESC', (b: any) => { b.problem.spacecraft.name = `SAT${REWRITE_LINE}`; }, 'body.problem.spacecraft.name'],
      ['spacecraft name with a bidi override', (b: any) => { b.problem.spacecraft.name = `SAT${BIDI_OVERRIDE}1`; }, 'body.problem.spacecraft.name'],
      ['spacecraft name of a zero-width space only', (b: any) => { b.problem.spacecraft.name = ZERO_WIDTH_SPACE; }, 'body.problem.spacecraft.name'],
      ['burn label with a line feed', (b: any) => { b.problem.burns[0].label = 'TCM\n1'; }, 'body.problem.burns[0].label'],
      ['title with a backspace', (b: any) => { b.problem.title = 'plan\bX'; }, 'body.problem.title'],
      ['reason with a carriage return', (b: any) => { b.reason = 'approach correction\rAPPROVED'; }, 'body.reason'],
      ['reason with a C1 control (CSI)', (b: any) => { b.reason = 'approach correction \u009b2K'; }, 'body.reason'],
    ])('should refuse the %s with 400 naming the field', async (_name, edit, path) => {
      const body = submission(schemaValidProblem()) as any;
      edit(body);
      expectRefused(await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body }), path);
    });

    it('should accept non-ASCII names and a reason on several lines', async () => {
      const body = submission(schemaValidProblem(), { reason: 'Orbit solution 2031-02-28:\n\tnew approach, correction needed' }) as any;
      body.problem.spacecraft.name = 'Žvaigždė-1 探测器';
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body });
      expect(res.status, res.text).toBe(202);
    });
  });

  describe('when a review, a cancellation or a token name carries control characters', () => {
    it('should refuse a review comment with ESC and a rejection whose comment is only a zero-width space', async () => {
      const token = svc.tokens.reviewer;
      const path = '/v1/plans/j-00000000-0000-4000-8000-000000000000/reviews';
      expectRefused(await svc.request('POST', path, { token, body: { decision: 'reject', comment: `bad${REWRITE_LINE}` } }), 'body.comment');
      expectRefused(await svc.request('POST', path, { token, body: { decision: 'reject', comment: ZERO_WIDTH_SPACE } }), 'body.comment');
    });

    it('should refuse a cancellation reason with ESC', async () => {
      const job = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(schemaValidProblem()) });
      const res = await svc.request('POST', `/v1/jobs/${job.body.jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: `x${ESC}[31m` } });
      expectRefused(res, 'body.reason');
    });

    it('should refuse a token name with ESC', async () => {
      const res = await svc.request('POST', '/v1/tokens', { token: svc.tokens.admin, body: { name: `ann${ESC}`, roles: ['submitter'] } });
      expectRefused(res, 'body.name');
    });
  });
});

describe('server text printed by the CLI', () => {
  describe('when a job stored in Redis carries control characters (enqueued without the API)', () => {
    it('should print them as visible escapes in veer status, text and JSON', async () => {
      const problem = schemaValidProblem();
      problem.spacecraft.name = `EVIL${REWRITE_LINE}SAT`;
      const outcome: any = await svc.api.deps.queue.submit({ problem, reason: `why${ESC}]0;title${'\u0007'}`, priority: 'routine' } as any, 'alice');
      const shown = 'EVIL\\u{1b}[1A\\u{1b}[2KSAT';
      for (const extra of [[], ['--json']]) {
        const run = await runVeer(['status', outcome.jobId, '--url', svc.url, '--token', svc.tokens.auditor, ...extra]);
        expect(run.code, run.err).toBe(0);
        expect(run.out + run.err).not.toMatch(/[\u0000-\u0008\u000B-\u001F\u007F-\u009F]/);
        if (extra.length === 0) expect(run.out).toContain(shown);
        else expect(JSON.parse(run.out).spacecraftName).toBe(shown);
      }
    });
  });
});
