import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ephemerisFor, propagateCommand } from '../../cli/commands/propagate.ts';
import { parsePropagateRequest, requestSpan, toPropagationRequest } from '../../cli/propagate-request-schema.ts';
import { createBuiltinEphemeris } from '../../propagator/ephemeris/index.ts';
import { PROPAGATE_JSON_SCHEMA } from '../../cli/propagate-report.ts';
import { InvalidInputError, OutOfSpanError } from '../../contract/errors.ts';

const base = {
  initial: { epoch: '2031-03-01T00:00:00 TDB', centre: 'earth', positionKm: [7000, 0, 1000], velocityKmS: [0, 7.6, 1.0] },
  durationS: 3000,
  forces: { centralBody: 'earth' },
};

function captureStdout(): { text: () => string } {
  const chunks: string[] = [];
  vi.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => {
    chunks.push(String(chunk));
    return true;
  });
  vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
  return { text: () => chunks.join('') };
}

function writeRequest(content: unknown): string {
  const dir = mkdtempSync(join(tmpdir(), 'veer-propagate-'));
  const path = join(dir, 'request.json');
  writeFileSync(path, JSON.stringify(content));
  return path;
}

afterEach(() => {
  vi.restoreAllMocks();
});

describe('veer propagate', () => {
  describe('when the request file is parsed', () => {
    it('should accept ISO epochs with a scale and TDB seconds alike', () => {
      const iso = requestSpan(parsePropagateRequest(base));
      const seconds = requestSpan(parsePropagateRequest({ ...base, initial: { ...base.initial, epoch: iso.startTdbS } }));
      expect(seconds.startTdbS).toBe(iso.startTdbS);
      expect(iso.endTdbS - iso.startTdbS).toBe(3000);
    });
    const bad: [string, unknown, RegExp][] = [
      ['a non-numeric position', { ...base, initial: { ...base.initial, positionKm: [1, 'x', 3] } }, /initial\.positionKm\[1\]/],
      ['an unknown body', { ...base, forces: { centralBody: 'vulcan' } }, /forces\.centralBody/],
      ['a tolerance out of range', { ...base, relativeTolerance: 0.1 }, /relativeTolerance/],
      ['both endEpoch and durationS', { ...base, endEpoch: '2031-03-02T00:00:00 TDB' }, /endEpoch/],
      ['an unknown key', { ...base, colour: 'blue' }, /request|colour/],
      ['a malformed burn epoch', { ...base, burns: [{ epoch: 'tomorrow', deltaVKmS: [0, 0, 0] }] }, /burns\[0\]\.epoch/],
      ['a negative altitude event', { ...base, events: [{ kind: 'altitude', body: 'earth', altitudeKm: -1 }] }, /events\[0\]\.altitudeKm/],
      ['a zero mass', { ...base, forces: { centralBody: 'earth', solarPressure: { areaM2: 1, reflectivityCoefficient: 1.2, massKg: 0 } } }, /forces\.solarPressure\.massKg/],
    ];
    for (const [name, json, pattern] of bad) {
      it(`should reject ${name} with InvalidInputError naming the field`, () => {
        const attempt = (): unknown => toPropagationRequest(parsePropagateRequest(json), createBuiltinEphemeris());
        expect(attempt).toThrow(InvalidInputError);
        expect(attempt).toThrow(pattern);
      });
    }
  });

  describe('when the requested span leaves the built-in ephemeris span [1800-01-01, 2200-01-01] TDB', () => {
    const sunCentred = { ...base, forces: { centralBody: 'sun', perturbingBodies: ['earth'] } };
    const day = 86400;
    const cases: [string, Record<string, unknown>, string][] = [
      ['an initial epoch in 2400', { ...sunCentred, initial: { ...base.initial, epoch: '2400-01-01T00:00:00 TDB' } }, 'initial.epoch'],
      ['a start on 2199-12-31 with durationS of 10 days', {
        ...sunCentred, initial: { ...base.initial, epoch: '2199-12-31T00:00:00 TDB' }, durationS: 10 * day,
      }, 'durationS'],
      ['an end epoch in 2200-02', {
        ...sunCentred, durationS: undefined, initial: { ...base.initial, epoch: '2199-12-01T00:00:00 TDB' }, endEpoch: '2200-02-01T00:00:00 TDB',
      }, 'endEpoch'],
      ['a backward span from 1800-01-02 over 5 days', {
        ...sunCentred, initial: { ...base.initial, epoch: '1800-01-02T00:00:00 TDB' }, durationS: -5 * day,
      }, 'durationS'],
      ['the uncached built-in ephemeris in 2400', {
        ...sunCentred, ephemeris: 'builtin', initial: { ...base.initial, epoch: '2400-01-01T00:00:00 TDB' },
      }, 'initial.epoch'],
    ];
    for (const [name, json, field] of cases) {
      it(`should reject ${name} with OutOfSpanError naming ${field}`, () => {
        let caught: unknown;
        try {
          ephemerisFor(parsePropagateRequest(json));
        } catch (error) {
          caught = error;
        }
        expect(caught).toBeInstanceOf(OutOfSpanError);
        expect((caught as OutOfSpanError).field).toBe(field);
        expect((caught as Error).message).not.toMatch(/startTdbS|endTdbS|toleranceKm/);
      });
    }
    it('should surface the field from the command itself', async () => {
      captureStdout();
      const path = writeRequest({ ...sunCentred, initial: { ...base.initial, epoch: '2199-12-31T00:00:00 TDB' }, durationS: 10 * day });
      await expect(propagateCommand.run([path, '--json'])).rejects.toThrow(/^durationS: .*2200-01-10T00:00:00\.000 TDB/);
    });
    it('should still build a cache for a backward span ending half a day after the built-in span starts', () => {
      const json = { ...sunCentred, initial: { ...base.initial, epoch: '1800-01-02T00:00:00 TDB' }, durationS: -0.5 * day };
      const ephemeris = ephemerisFor(parsePropagateRequest(json));
      const { endTdbS } = requestSpan(parsePropagateRequest(json));
      expect(ephemeris.span.startTdbS).toBeLessThanOrEqual(endTdbS);
      expect(ephemeris.name).toMatch(/chebyshev/i);
    });
    it('should not consult the ephemeris span for a pure two-body request in 2400', () => {
      const json = { ...base, initial: { ...base.initial, epoch: '2400-01-01T00:00:00 TDB' } };
      expect(ephemerisFor(parsePropagateRequest(json)).name).toMatch(/astronomy-engine/);
    });
  });

  describe('when run on a two-body request with --json', () => {
    it('should print the documented JSON contract and exit 0', async () => {
      const out = captureStdout();
      const code = await propagateCommand.run([writeRequest({ ...base, withStm: true, outputStepS: 1000 }), '--json']);
      expect(code).toBe(0);
      const json = JSON.parse(out.text()) as Record<string, unknown>;
      expect(json.schema).toBe(PROPAGATE_JSON_SCHEMA);
      expect(json.outcome).toBe('finished');
      expect(Object.keys(json)).toEqual(['schema', 'outcome', 'message', 'final', 'stm', 'burnSensitivities', 'finalMassKg', 'finiteBurns', 'samples', 'events', 'stats', 'warnings', 'run']);
      expect((json.final as { epoch: string }).epoch).toBe('2031-03-01T00:50:00.000000 TDB');
      expect(json.stm).toHaveLength(36);
      expect(json.samples).toHaveLength(4);
    });
  });

  describe('when Encke is asked for a radial (zero angular momentum) start', () => {
    const radial = { ...base, method: 'encke', durationS: 600, initial: { ...base.initial, velocityKmS: [3.5, 0, 0.5] } };
    it('should report the method asked for and the method used in --json', async () => {
      const out = captureStdout();
      const code = await propagateCommand.run([writeRequest(radial), '--json']);
      expect(code).toBe(0);
      const json = JSON.parse(out.text()) as { run: { method: string; methodUsed: string }; warnings: string[] };
      expect(json.run.method).toBe('encke');
      expect(json.run.methodUsed).toBe('cowell');
      expect(json.warnings.join(' ')).toMatch(/fell back to 'cowell'/);
    });
    it('should say so in the readable report', async () => {
      const out = captureStdout();
      await propagateCommand.run([writeRequest(radial)]);
      expect(out.text()).toMatch(/method encke \(used: cowell; see warnings\)/);
    });
  });

  describe('when Encke is asked for an ordinary orbit', () => {
    it('should report encke as the method used', async () => {
      const out = captureStdout();
      await propagateCommand.run([writeRequest({ ...base, method: 'encke' }), '--json']);
      expect((JSON.parse(out.text()) as { run: { methodUsed: string } }).run.methodUsed).toBe('encke');
    });
  });

  describe('when run without --json on a trajectory that hits the Earth', () => {
    it('should print a readable report with the impact and exit 3', async () => {
      const out = captureStdout();
      const code = await propagateCommand.run([writeRequest({ ...base, initial: { ...base.initial, velocityKmS: [0, 7.0, 0.5] } })]);
      expect(code).toBe(3);
      expect(out.text()).toMatch(/outcome: impact/);
      expect(out.text()).toMatch(/event: impact earth/);
    });
  });
});
