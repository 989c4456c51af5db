/**
 * evaluateComponent without the partial (a Monte Carlo sample has no STM to chain it with): the value must be
 * the very number the evaluation with the partial gives (the reference: the same function asked for both),
 * for every kind of component, and the partial null.
 */
import { describe, expect, it } from 'vitest';
import { evaluateComponent } from '../../planner/targeting/target-geometry.ts';
import type { ComponentQuantity, TargetComponent } from '../../planner/targeting/target-components.ts';

// An invented hyperbolic approach to Mars (km, km/s, J2000 equatorial, relative to Mars).
const APPROACH = [-25000, 30000, 4000, 2.1, -2.9, -0.6];
const QUANTITIES: ComponentQuantity[] = [
  { q: 'bdott', body: 'mars', plane: 'ecliptic' }, { q: 'bdotr', body: 'mars', plane: 'equator' },
  { q: 'ca-epoch', body: 'mars' }, { q: 'periapsis-radius', body: 'mars' }, { q: 'periapsis-altitude', body: 'mars' },
  { q: 'inclination', body: 'mars', plane: 'ecliptic' }, { q: 'state', axis: 4, centre: 'mars' },
];
const component = (quantity: ComponentQuantity): TargetComponent => ({
  targetIndex: 0, kind: 'b-plane', component: quantity.q, unit: 'km', body: 'mars', requested: 0, tolerance: 1, quantity,
  station: { kind: 'approach', body: 'mars' },
});

describe('evaluateComponent', () => {
  describe('when the partial is not wanted', () => {
    it('should give the same value as with the partial, and no partial, for every kind of component', () => {
      for (const q of QUANTITIES) {
        const full = evaluateComponent(component(q), APPROACH, 1e8);
        const alone = evaluateComponent(component(q), APPROACH, 1e8, { partial: false });
        expect(alone.value, q.q).toBe(full.value);
        expect(Number.isFinite(alone.value), q.q).toBe(true);
        expect(alone.partial, q.q).toBeNull();
        expect(full.partial, q.q).toHaveLength(6);
      }
    });
  });
});
