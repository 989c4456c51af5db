/**
 * A finite burn inside a trajectory evaluation: the propagation request of its arc, and how the arc's
 * sensitivities enter the chained Jacobians of evaluate-trajectory.ts:
 *   G ← Φ G + ψ_m ⊗ (∂m/∂controls)   (the ignition mass depends on earlier controls)
 *   G[:, own] += ∂x/∂u · ∂u/∂offset, ∂x/∂duration, ∂x/∂ignition     (propagator finite-burn partials)
 * and, for the dispersion, its equivalent-Δv sensitivity: an execution error δ(Δv) along the burn is a
 * duration error δD = δ|Δv| / (F/m_after) (d|Δv|/dD of the rocket equation), and across it a pointing
 * error δu = δ(Δv)⊥ / |Δv| (in the burn's axes at ignition), so
 *   B = ∂x/∂D ⊗ û / (F/m_after) + ∂x/∂u_local · M · (I − ûûᵀ) / |Δv|.
 * Units km, s, km/s, kg, N; J2000 equatorial.
 */
import type { FiniteBurnRecord, FiniteBurnSpec, PropagationResult, Vec3 } from '../../propagator/index.ts';
import type { ControlDescriptor } from '../../contract/plan-types.ts';
import type { BurnSetting } from './controls.ts';
import type { Rotation3 } from '../../propagator/index.ts';

type M = number[][];

/** The chained sensitivities of evaluate-trajectory.ts plus the mass rows they need with finite burns. */
export interface ChainState {
  /** d(state)/d(controls) 6 x n, d(state)/d(initial state) 6 x 6, per burn d(state)/d(Δv) 6 x 3. */
  G: M;
  P: M;
  B: M[];
  /** d(mass)/d(controls), n; d(mass)/d(Δv) per burn, 3 each (kg per km/s or per control unit). */
  massRow: number[];
  massB: number[][];
}

/** The propagation spec of a finite setting in the burn's frame. */
export function finiteSpec(setting: BurnSetting): FiniteBurnSpec {
  const f = setting.finite!;
  return { startTdbS: f.startTdbS, durationS: f.durationS, thrustN: f.thrustN, massFlowKgS: f.massFlowKgS, axes: setting.frame, direction: f.directionLocal };
}

const column = (m6x3: readonly number[], w: readonly number[]): number[] => [0, 1, 2, 3, 4, 5].map((i) => m6x3[3 * i] * w[0] + m6x3[3 * i + 1] * w[1] + m6x3[3 * i + 2] * w[2]);

function phiTimesPlusOuter(phi: readonly number[], a: M, psi: readonly number[], row: readonly number[]): M {
  return [0, 1, 2, 3, 4, 5].map((i) => row.map((r, j) => {
    let s = psi[i] * r;
    for (let p = 0; p < 6; p++) s += phi[6 * i + p] * a[p][j];
    return s;
  }));
}

/** The equivalent-Δv sensitivity of the file comment, 6 x 3 (state at the end of `res` per inertial km/s),
 * and d(mass)/d(Δv), 3 (kg per km/s); `res` flew the one burn `spec` with the STM. */
export function equivalentDeltaV(res: PropagationResult, rec: FiniteBurnRecord, spec: FiniteBurnSpec, axes: Rotation3): { b: M; mass: number[] } {
  const sens = res.finiteBurnSensitivities![0];
  const u = rec.directionAtStartInertial;
  const dv = rec.idealDeltaVKmS;
  const rate = spec.thrustN / 1000 / rec.massAfterKg;
  // ∂x/∂u_local · M · (I − ûûᵀ): the columns of ∂x/∂u_local·M are ∂x/∂u_local times each inertial axis's local components.
  const across = [0, 1, 2].map((k) => {
    const e = [0, 0, 0];
    e[k] = 1;
    const perp = e.map((x, i) => x - u[k] * u[i]);
    const local = axes.map((a) => a[0] * perp[0] + a[1] * perp[1] + a[2] * perp[2]);
    return column(sens.direction, local);
  });
  const b = [0, 1, 2, 3, 4, 5].map((i) => [0, 1, 2].map((k) => (sens.durationS[i] * u[k]) / rate + across[k][i] / dv));
  return { b, mass: u.map((x) => (-spec.massFlowKgS * x) / rate) };
}

/** Updates `chain` for a flown arc of burn `burnIndex` (result with the STM); see the file comment. */
export function chainFiniteArc(chain: ChainState, res: PropagationResult, setting: BurnSetting, axes: Rotation3,
  controlMap: { burnIndex: number; kind: ControlDescriptor['kind'] }[], burnIndex: number): void {
  const phi = res.stm as number[];
  const psiMass = res.initialMassSensitivity as number[];
  const sens = res.finiteBurnSensitivities![0];
  const rec = res.finiteBurns![0];
  const spec = finiteSpec(setting);
  chain.G = phiTimesPlusOuter(phi, chain.G, psiMass, chain.massRow);
  chain.P = phiTimesPlusOuter(phi, chain.P, psiMass, [0, 0, 0, 0, 0, 0]);
  chain.B = chain.B.map((b, k) => phiTimesPlusOuter(phi, b, psiMass, chain.massB[k]));
  const f = setting.finite!;
  controlMap.forEach((c, j) => {
    if (c.burnIndex !== burnIndex) return;
    let col: number[] | null = null;
    if (c.kind === 'point0' || c.kind === 'point1') col = column(sens.direction, f.directionPartials[c.kind === 'point0' ? 0 : 1]);
    else if (c.kind === 'duration') {
      col = sens.durationS;
      chain.massRow[j] -= spec.massFlowKgS;
    } else if (c.kind === 'ignition') col = sens.startTdbS;
    if (col !== null) for (let i = 0; i < 6; i++) chain.G[i][j] += col[i];
  });
  const eq = equivalentDeltaV(res, rec, spec, axes);
  chain.B.push(eq.b);
  chain.massB.push(eq.mass);
}

/** The ideal Δv along the thrust direction at ignition, km/s, J2000 equatorial and in the burn's axes. */
export function equivalentDeltaVKmS(rec: FiniteBurnRecord, setting: BurnSetting): { inertial: Vec3; local: Vec3 } {
  const dv = rec.idealDeltaVKmS;
  const u = rec.directionAtStartInertial;
  const l = setting.finite!.directionLocal;
  return { inertial: [u[0] * dv, u[1] * dv, u[2] * dv], local: [l[0] * dv, l[1] * dv, l[2] * dv] };
}
