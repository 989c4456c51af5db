/**
 * The STM for Encke's method without integrating the full gravity gradient: Φ(t) = Φ_K(τ) · M(t), where
 * Φ_K(τ) is the reference conic's analytic two-body STM over τ = t − t_ref (kepler/two-body-stm.ts) and M
 * is integrated. From Φ' = A(x) Φ and Φ_K' = A_K(ρ) Φ_K (variation of parameters):
 *     M' = Φ_K⁻¹ (A(x) − A_K(ρ)) Φ_K M,   A − A_K = [[0, 0], [ΔG, 0]],   ΔG = G(x) − G_K(ρ),
 * with G(x) the force model's full gradient ∂a/∂r at the true position x = ρ + δ and
 * G_K(ρ) = (μ/ρ³)(3 ρ̂ρ̂ᵀ − I) the reference conic's own. ΔG is of the size of the deviation and the
 * perturbations, so M changes as slowly as δ does and the steps Encke chooses for δ serve M as well (the
 * fast part of Φ near periapsis is carried exactly by Φ_K). Two-body flow is symplectic, so
 * Φ_K⁻¹ = [[Dᵀ, −Bᵀ], [−Cᵀ, Aᵀ]] for Φ_K = [[A, B], [C, D]] (Battin 1999, §9.7) — no matrix inversion.
 * At a restart of the reference conic M becomes Φ_K(τ) M, i.e. Φ itself, and Φ_K starts again at I.
 */
import { multiply6 } from '../math/matrix6.ts';

/**
 * Writes G_K(ρ) = ∂(−μρ/|ρ|³)/∂ρ = (μ/ρ³)(3 ρ̂ρ̂ᵀ − I) (1/s², 3x3 row-major) into out.
 * @param rho reference-conic position, km (any inertial axes)
 * @param mu GM of the reference conic's attracting body, km³/s²
 */
export function keplerGradientInto(rho: ArrayLike<number>, mu: number, out: Float64Array): void {
  const r2 = rho[0] * rho[0] + rho[1] * rho[1] + rho[2] * rho[2];
  const k = mu / (r2 * Math.sqrt(r2));
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) out[3 * i + j] = k * ((3 * rho[i] * rho[j]) / r2 - (i === j ? 1 : 0));
  }
}

/** Work space of deviationStmRatesInto (one per dynamics object: no allocation per call). */
export class EnckeStmScratch {
  readonly top = new Float64Array(18);
  readonly forced = new Float64Array(18);
  readonly product = new Float64Array(36);
}

/**
 * Writes M' (36 numbers, row-major, 1/s) into out[offset..offset+35].
 * @param phiK Φ_K(τ), the reference conic's 6x6 STM (row-major; km, km/s)
 * @param deltaG ΔG = G(x) − G_K(ρ), 3x3 row-major, 1/s²
 * @param m M, 6x6 row-major, read from m[offset..offset+35]
 */
export function deviationStmRatesInto(phiK: ArrayLike<number>, deltaG: Float64Array, m: Float64Array,
  offset: number, out: Float64Array, scratch: EnckeStmScratch): void {
  const { top, forced } = scratch;
  // top = rows 0..2 of Φ_K M (∂r/∂x0 of the true trajectory).
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 6; j++) {
      let s = 0;
      for (let k = 0; k < 6; k++) s += phiK[6 * i + k] * m[offset + 6 * k + j];
      top[6 * i + j] = s;
    }
  }
  // forced = ΔG · top (the velocity rows of (A − A_K) Φ).
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 6; j++) {
      forced[6 * i + j] = deltaG[3 * i] * top[j] + deltaG[3 * i + 1] * top[6 + j] + deltaG[3 * i + 2] * top[12 + j];
    }
  }
  // M' = [[−Bᵀ], [Aᵀ]] · forced, A = Φ_K[0..2][0..2], B = Φ_K[0..2][3..5].
  for (let i = 0; i < 6; i++) {
    const sign = i < 3 ? -1 : 1;
    const col = i < 3 ? 3 + i : i - 3;
    for (let j = 0; j < 6; j++) {
      out[offset + 6 * i + j] = sign * (phiK[col] * forced[j] + phiK[6 + col] * forced[6 + j] + phiK[12 + col] * forced[12 + j]);
    }
  }
}

/** Φ = Φ_K · M written back over M in y[offset..offset+35] (the restart of the reference conic). */
export function foldReferenceStm(phiK: ArrayLike<number>, y: Float64Array, offset: number, scratch: EnckeStmScratch): void {
  multiply6(phiK, y.subarray(offset, offset + 36), scratch.product);
  y.set(scratch.product, offset);
}
