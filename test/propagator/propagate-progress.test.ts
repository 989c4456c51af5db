import { afterEach, describe, expect, it, vi } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PropagateProgress } from '../../cli/propagate-progress.ts';
import { propagateCommand } from '../../cli/commands/propagate.ts';

function printer(heartbeatMs = 2000): { lines: string[]; clock: { ms: number }; progress: PropagateProgress } {
  const lines: string[] = [];
  const clock = { ms: 0 };
  const progress = new PropagateProgress({ write: (l) => lines.push(l.trim()), now: () => clock.ms, heartbeatMs });
  return { lines, clock, progress };
}

/** Collects what is written to stderr (trimmed), instead of printing it; restored after each test. */
function captureStderr(): string[] {
  const err: string[] = [];
  vi.spyOn(process.stderr, 'write').mockImplementation((chunk: string | Uint8Array) => {
    err.push(String(chunk).trim());
    return true;
  });
  return err;
}

/** Writes a propagation request to a new temp folder; returns its path. */
function requestFile(request: unknown): string {
  const dir = mkdtempSync(join(tmpdir(), 'veer-progress-'));
  const path = join(dir, 'request.json');
  writeFileSync(path, JSON.stringify(request));
  return path;
}

afterEach(() => {
  vi.restoreAllMocks();
});

describe('veer propagate progress', () => {
  describe('when a run starts', () => {
    it('should print 0 % at once, before any update', () => {
      const { lines, progress } = printer();
      progress.start();
      progress.start();
      expect(lines).toEqual(['veer propagate:   0%']);
    });
  });

  describe('when updates arrive quickly', () => {
    it('should print each tenth once, skip what lies between, and end at 100 % once', () => {
      const { lines, progress } = printer();
      progress.start();
      for (let f = 0; f <= 1.0001; f += 0.013) progress.update(Math.min(f, 1));
      progress.update(1);
      progress.update(1);
      expect(lines.map((l) => Number(/(\d+)%/.exec(l)![1]))).toEqual([0, 10, 20, 31, 40, 50, 61, 70, 80, 91, 100]);
    });
  });

  describe('when the run advances slowly between tenths', () => {
    it('should print a heartbeat line once the quiet time has passed and the fraction moved', () => {
      const { lines, clock, progress } = printer(2000);
      progress.start();
      clock.ms = 1500;
      progress.update(0.02);
      clock.ms = 2500;
      progress.update(0.03);
      clock.ms = 5000;
      progress.update(0.03); // no advance: nothing new to say
      expect(lines).toEqual(['veer propagate:   0%', 'veer propagate:   3%']);
    });
  });

  describe('when the command runs a two-body request', () => {
    it('should write 0 % first and 100 % last on stderr', async () => {
      vi.spyOn(process.stdout, 'write').mockImplementation(() => true);
      const err = captureStderr();
      const path = requestFile({
        initial: { epoch: '2031-03-01T00:00:00 TDB', centre: 'earth', positionKm: [7000, 0, 1000], velocityKmS: [0, 7.6, 1.0] },
        durationS: 3000, forces: { centralBody: 'earth' },
      });
      expect(await propagateCommand.run([path, '--json'])).toBe(0);
      expect(err[0]).toBe('veer propagate:   0%');
      expect(err.filter((l) => l === 'veer propagate:   0%')).toHaveLength(1);
      expect(err[err.length - 1]).toBe('veer propagate: 100%');
    });
    it('should print no progress line before rejecting a span outside the ephemeris', async () => {
      const err = captureStderr();
      const path = requestFile({
        initial: { epoch: '2400-01-01T00:00:00 TDB', centre: 'earth', positionKm: [3e6, 1e6, 5e5], velocityKmS: [1.5, 2.5, 0.8] },
        durationS: 86400, forces: { centralBody: 'sun', perturbingBodies: ['earth'] },
      });
      await expect(propagateCommand.run([path])).rejects.toThrow(/^initial\.epoch/);
      expect(err).toEqual([]);
    });
  });
});
