import { describe, expect, it } from 'vitest';
import { main } from '../cli/main.ts';

describe('veer command', () => {
  describe('when the command is unknown', () => {
    it('should exit with code 2 (usage error)', async () => {
      const errors: string[] = [];
      const write = process.stderr.write.bind(process.stderr);
      process.stderr.write = ((chunk: string) => { errors.push(String(chunk)); return true; }) as typeof process.stderr.write;
      try {
        expect(await main(['no-such-command'])).toBe(2);
      } finally {
        process.stderr.write = write;
      }
      expect(errors.join('')).toContain("unknown command 'no-such-command'");
    });
  });
});
