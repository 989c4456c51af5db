import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { propagateCommand } from '../../cli/commands/propagate.ts';
import { parsePropagateRequest, requestSpan, toPropagationRequest } from '../../cli/propagate-request-schema.ts';
import { createBuiltinEphemeris } from '../../propagator/ephemeris/index.ts';
import { PROPAGATE_JSON_SCHEMA } from '../../cli/propagate-report.ts';
import { InvalidInputError } from '../../propagator/errors.ts';

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

  describe('when run on a two-body request with --json', () => {
    it('should print the documented JSON contract and exit 0', async () => {
      const out = captureStdout();
      const code = await propagateCommand.run([writeRequest({ ...base, withStm: true, outputStepS: 1000 }), '--json']);
      expect(code).toBe(0);
      const json = JSON.parse(out.text()) as Record<string, unknown>;
      expect(json.schema).toBe(PROPAGATE_JSON_SCHEMA);
      expect(json.outcome).toBe('finished');
      expect(Object.keys(json)).toEqual(['schema', 'outcome', 'message', 'final', 'stm', 'burnSensitivities', 'samples', 'events', 'stats', 'warnings', 'run']);
      expect((json.final as { epoch: string }).epoch).toBe('2031-03-01T00:50:00.000000 TDB');
      expect(json.stm).toHaveLength(36);
      expect(json.samples).toHaveLength(4);
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
