/**
 * Reading a leap-seconds.list: the format's checks, each refusal naming the line. The valid list used here
 * is the IERS copy in test/fixtures/leap-seconds (see its README); the broken ones are edits of it.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { BUILTIN_LEAP_SECONDS, InvalidInputError, parseLeapSecondsList } from '../../propagator/index.ts';

const IERS = readFileSync('test/fixtures/leap-seconds/iers-2025-07.list', 'utf8');
const lineOf = (text: string, needle: string): number => text.split('\n').findIndex((l) => l.includes(needle)) + 1;
const withoutHash = (text: string): string => text.replace(/^#h.*$/m, '#');

describe('parseLeapSecondsList', () => {
  describe('when the list is unmodified', () => {
    it('should verify its #h and read every step, the update and the expiry', () => {
      const table = parseLeapSecondsList(IERS, 'iers.list', 'abc');
      expect(table.steps).toHaveLength(28);
      expect(table.expiresUtc).toBe('2026-06-28');
      expect(table.updatedUtc).toBe('2025-07-07');
      expect(table.origin).toBe('file');
      expect(table.path).toBe('iers.list');
      expect(table.sha256).toBe('abc');
      expect(table.description).toContain('SHA-1 #h verified');
    });
    it('should accept a list without a #h line (nothing to verify) and say so', () => {
      expect(parseLeapSecondsList(withoutHash(IERS), 'x').description).toContain('no #h hash');
    });
  });

  describe('when the list is tampered or damaged', () => {
    it('should refuse a changed step under the original #h, naming the #h line', () => {
      const tampered = IERS.replace('3692217600      37', '3692217600      38');
      const err = (() => { try { parseLeapSecondsList(tampered, 'leap.list'); } catch (e) { return e; } return null; })();
      expect(err).toBeInstanceOf(InvalidInputError);
      expect((err as InvalidInputError).code).toBe('LEAP_SECONDS_HASH');
      expect((err as InvalidInputError).field).toBe('leap.list');
      expect((err as Error).message).toContain(`line ${lineOf(IERS, '#h')}:`);
    });
    it('should refuse a changed expiry under the original #h', () => {
      expect(() => parseLeapSecondsList(IERS.replace('#@\t3991593600', '#@\t4007750400'), 'x')).toThrow(/'#h' SHA-1 .* does not match/);
    });
    it('should refuse epochs that do not increase, naming the line', () => {
      const swapped = withoutHash(IERS).replace('3644697600      36', '3439756800      36');
      expect(() => parseLeapSecondsList(swapped, 'x')).toThrow(`line ${lineOf(IERS, '3644697600')}: epoch 2009-01-01 does not come after 2012-07-01`);
    });
    it('should refuse an offset that does not grow by exactly 1 s, naming the line', () => {
      const jump = withoutHash(IERS).replace('3692217600      37', '3692217600      38');
      expect(() => parseLeapSecondsList(jump, 'x')).toThrow(`line ${lineOf(IERS, '3692217600')}: TAI − UTC 38 s at 2017-01-01 is not exactly 1 s more than 36 s`);
    });
    it('should refuse a list without its #@ expiry, a malformed line and a step not at 00:00 UTC', () => {
      expect(() => parseLeapSecondsList(withoutHash(IERS).replace(/^#@.*$/m, '#'), 'x')).toThrow(/no '#@' expiry line/);
      expect(() => parseLeapSecondsList(withoutHash(IERS).replace('2272060800      10', '2272060800 ten'), 'x'))
        .toThrow(`line ${lineOf(IERS, '2272060800')}: expected '<NTP seconds> <TAI − UTC in whole seconds>'`);
      expect(() => parseLeapSecondsList(withoutHash(IERS).replace('2272060800', '2272060801'), 'x')).toThrow(/is not 00:00:00 UTC/);
    });
    it('should refuse an expiry that is not after the last step', () => {
      expect(() => parseLeapSecondsList(withoutHash(IERS).replace('3991593600', '3692217600'), 'x')).toThrow(/expiry 2017-01-01 is not after the last leap second/);
    });
  });

  describe('when compared with the built-in table', () => {
    it('should hold the same steps and expiry (the built-in one was typed from memory)', () => {
      const table = parseLeapSecondsList(IERS, 'x');
      expect(table.steps).toEqual(BUILTIN_LEAP_SECONDS.steps);
      expect(table.expiresUtc).toBe(BUILTIN_LEAP_SECONDS.expiresUtc);
      expect(table.updatedUtc).toBe(BUILTIN_LEAP_SECONDS.updatedUtc);
    });
  });
});
