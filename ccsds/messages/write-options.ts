/** How numbers and epochs are printed by the OPM and OEM writers. */
import type { TimeScale } from '../../propagator/index.ts';

export interface OdmWriteOptions {
  /** KVN text or NDM/XML. @defaultValue 'kvn' */
  encoding?: 'kvn' | 'xml';
  /** Digits after the point for positions, km. @defaultValue 6 (1 mm) */
  positionDecimals?: number;
  /** Digits after the point for velocities, km/s. @defaultValue 9 (1 µm/s) */
  velocityDecimals?: number;
  /** Digits after the point for accelerations, km/s². @defaultValue 12 */
  accelerationDecimals?: number;
  /** Significant digits of covariance elements (exponent notation). @defaultValue 10 */
  covarianceDigits?: number;
  /** Digits after the point of epoch seconds, in [0, 6]. @defaultValue 6 */
  epochFractionDigits?: number;
  /** Time system epochs are written in. TDB by default: it is the internal scale and has no leap-second
   * table horizon. @defaultValue 'TDB' */
  timeSystem?: TimeScale;
}

export const ODM_WRITE_DEFAULTS: Readonly<Required<OdmWriteOptions>> = Object.freeze({
  encoding: 'kvn',
  positionDecimals: 6,
  velocityDecimals: 9,
  accelerationDecimals: 12,
  covarianceDigits: 10,
  epochFractionDigits: 6,
  timeSystem: 'TDB',
});

/** Options merged over the defaults. */
export function writeOptions(options: OdmWriteOptions | undefined): Required<OdmWriteOptions> {
  return { ...ODM_WRITE_DEFAULTS, ...options };
}
