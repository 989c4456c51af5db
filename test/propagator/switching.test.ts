import { describe, expect, it } from 'vitest';
import { changeCentre, laplaceSoiRadiusKm, propagate, type PropagationRequest } from '../../propagator/index.ts';
import { flybyEphemeris, flybyStart, forcesAbout, PERIAPSIS_EPOCH } from './flyby-fixture.ts';

const END = PERIAPSIS_EPOCH + 3 * 86400;
const { helio, relMars } = flybyStart(2.5); // ~667 000 km from Mars: outside its sphere of influence
const base = (extra: Partial<PropagationRequest>): PropagationRequest => ({
  initial: helio, endEpochTdbS: END, forces: forcesAbout('sun'), ephemeris: flybyEphemeris,
  relativeTolerance: 1e-12, absoluteTolerance: 1e-12, switching: { enabled: true }, ...extra,
});

describe('central-body switching', () => {
  describe('when a heliocentric trajectory passes through the sphere of influence of Mars', () => {
    const r = propagate(base({}));
    it('should switch to Mars on entry and back to the Sun on exit, recording both', () => {
      expect(r.outcome).toBe('finished');
      expect(r.stats.switches.map((s) => `${s.from}->${s.to}`)).toEqual(['sun->mars', 'mars->sun']);
      expect(r.final.centre).toBe('sun');
      const kinds = r.events.map((e) => e.kind);
      expect(kinds).toEqual(['soi-entry', 'soi-exit']);
    });
    it('should locate the crossings on the Laplace radius', () => {
      const soi = laplaceSoiRadiusKm('mars');
      for (const e of r.events) expect(Math.abs(e.distanceKm! - soi), e.kind).toBeLessThan(1e-6);
      expect(r.stats.switches[0].epochTdbS).toBe(r.events[0].epochTdbS);
    });
  });

  describe('when Encke is asked for the whole switched run', () => {
    it('should report encke as the method used when no segment fell back, cowell by default', () => {
      expect(propagate(base({ method: 'encke', endEpochTdbS: PERIAPSIS_EPOCH })).methodUsed).toBe('encke');
      expect(propagate(base({ endEpochTdbS: PERIAPSIS_EPOCH })).methodUsed).toBe('cowell');
    });
  });

  describe('when the caller sets the radius', () => {
    it('should switch on that radius instead', () => {
      const r = propagate(base({ switching: { enabled: true, radiusKm: { mars: 200_000 } } }));
      expect(r.events.length).toBe(2);
      for (const e of r.events) expect(Math.abs(e.distanceKm! - 200_000)).toBeLessThan(1e-6);
    });
  });

  describe('when the run starts inside the sphere of influence', () => {
    it('should switch at the start epoch', () => {
      const inside = flybyStart(1.0).helio;
      const r = propagate(base({ initial: inside }));
      expect(r.stats.switches[0]).toEqual({ epochTdbS: inside.epochTdbS, from: 'sun', to: 'mars' });
      expect(r.stats.switches.length).toBe(2);
    });
  });

  describe('when the STM and a burn ride through the switches', () => {
    it('should match the STM and burn sensitivity of a Mars-centred run', () => {
      const burns = [{ epochTdbS: PERIAPSIS_EPOCH - 3600, deltaVKmS: [0.001, 0, -0.002] as [number, number, number] }];
      const sw = propagate(base({ withStm: true, burns, endEpochTdbS: PERIAPSIS_EPOCH + 86400 }));
      const mc = propagate(base({ withStm: true, burns, endEpochTdbS: PERIAPSIS_EPOCH + 86400, initial: relMars,
        forces: forcesAbout('mars'), switching: undefined }));
      expect(sw.stats.switches.length).toBe(1); // still inside at the end
      const scale = Math.max(...mc.stm!.map(Math.abs));
      for (let k = 0; k < 36; k++) expect(Math.abs(sw.stm![k] - mc.stm![k]) / scale, `Φ[${k}]`).toBeLessThan(1e-6);
      const sScale = Math.max(...mc.burnSensitivities![0].map(Math.abs));
      for (let k = 0; k < 18; k++) {
        expect(Math.abs(sw.burnSensitivities![0][k] - mc.burnSensitivities![0][k]) / sScale).toBeLessThan(1e-6);
      }
      const d = changeCentre(sw.final, 'mars', flybyEphemeris);
      expect(Math.hypot(...d.positionKm.map((x, i) => x - mc.final.positionKm[i]))).toBeLessThan(1e-4);
    });
  });
});

describe('central-body switching with output samples', () => {
  describe('when outputStepS is set', () => {
    it('should keep one grid from the start across the switches, each sample relative to its centre', () => {
      const step = 6 * 3600;
      const r = propagate(base({ outputStepS: step }));
      const epochs = r.samples.map((s) => s.epochTdbS);
      expect(epochs[0]).toBe(helio.epochTdbS);
      expect(epochs[epochs.length - 1]).toBe(END);
      for (const t of epochs.slice(1, -1)) expect(((t - helio.epochTdbS) / step) % 1).toBeCloseTo(0, 9);
      expect(epochs.length).toBe(Math.ceil((END - helio.epochTdbS) / step) + 1);
      const centres = new Set(r.samples.map((s) => s.centre));
      expect([...centres].sort()).toEqual(['mars', 'sun']);
      // A sample on the grid equals the final state of a run ending there.
      const k = 10;
      const at = helio.epochTdbS + k * step;
      const direct = propagate(base({ endEpochTdbS: at }));
      const d = r.samples[k].centre === direct.final.centre ? r.samples[k]
        : changeCentre(r.samples[k], direct.final.centre, flybyEphemeris);
      expect(Math.hypot(...d.positionKm.map((x, i) => x - direct.final.positionKm[i]))).toBeLessThan(1e-5);
    });
  });
});

describe('events and switching backward in time', () => {
  describe('when the flyby is propagated from after to before periapsis', () => {
    it('should find the same closest approach and switch in reverse order', () => {
      const fwd = propagate(base({ events: [{ kind: 'closest-approach', body: 'mars' }] }));
      const back = propagate(base({ initial: fwd.final, endEpochTdbS: helio.epochTdbS,
        events: [{ kind: 'closest-approach', body: 'mars' }] }));
      const ca = (r: typeof fwd) => r.events.find((e) => e.kind === 'closest-approach')!;
      expect(Math.abs(ca(back).epochTdbS - ca(fwd).epochTdbS)).toBeLessThan(1e-3);
      expect(Math.abs(ca(back).distanceKm! - ca(fwd).distanceKm!)).toBeLessThan(1e-3);
      expect(back.stats.switches.map((s) => `${s.from}->${s.to}`)).toEqual(['sun->mars', 'mars->sun']);
      expect(Math.hypot(...back.final.positionKm.map((x, i) => x - helio.positionKm[i]))).toBeLessThan(1e-2);
    });
  });
});

describe('central-body switching with progress and cancellation', () => {
  describe('when progress is reported', () => {
    it('should rise monotonically over the whole span and end at 1', () => {
      const seen: number[] = [];
      const r = propagate(base({}), { onProgress: (f) => seen.push(f) });
      expect(r.outcome).toBe('finished');
      expect(seen.length).toBeGreaterThan(1); // propagate() reports every 64 steps, then 1 at the end
      for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);
      expect(seen[seen.length - 1]).toBe(1);
    });
  });
  describe('when the signal fires', () => {
    it('should stop with outcome cancelled', () => {
      const controller = new AbortController();
      controller.abort();
      const r = propagate(base({}), { signal: controller.signal });
      expect(r.outcome).toBe('cancelled');
      expect(r.stats.switches.length).toBe(0);
    });
  });
});
