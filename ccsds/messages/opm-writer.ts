/**
 * Orbit Parameter Message writer (CCSDS 502.0-B section 3), KVN or XML, in the standard's block order.
 * Epoch texts are written as held in the Opm (build them with formatCcsdsEpoch); numbers with the
 * precision in the options. Frame names the readers would refuse (an ecliptic one, say) are refused before
 * anything is written (InvalidInputError naming the field).
 */
import { lowerTriangle } from './covariance.ts';
import { assertWritableFrame } from './frames.ts';
import { headerItems, metadataLeadItems } from './header-items.ts';
import type { Opm } from './odm-types.ts';
import { type Item, renderKvn, renderXml } from '../syntax/render.ts';
import { formatExponent, formatFixed } from '../syntax/values.ts';
import { type OdmWriteOptions, writeOptions } from './write-options.ts';

/** Writes an OPM as KVN (default) or XML text. */
export function writeOpm(opm: Opm, options?: OdmWriteOptions): string {
  const o = writeOptions(options);
  const items: Item[] = [];
  const kw = (keyword: string, value: string, unit?: string): void => {
    items.push(unit ? { kind: 'keyword', keyword, value, unit } : { kind: 'keyword', keyword, value });
  };
  const comments = (list: readonly string[]): void => list.forEach((text) => items.push({ kind: 'comment', text }));
  const fixed = formatFixed;
  const { header, metadata, state } = opm;
  assertWritableFrame('metadata.refFrame', metadata.refFrame, metadata.centre, false);
  if (opm.covariance?.covRefFrame !== undefined) assertWritableFrame('covariance.covRefFrame', opm.covariance.covRefFrame, metadata.centre, true);
  opm.maneuvers.forEach((m, i) => assertWritableFrame(`maneuvers[${i}].manRefFrame`, m.manRefFrame, metadata.centre, true));

  items.push(...headerItems('CCSDS_OPM_VERS', header, o.encoding));
  items.push({ kind: 'blank' });
  items.push({ kind: 'open', name: 'body' }, { kind: 'open', name: 'segment' }, { kind: 'open', name: 'metadata' });
  items.push(...metadataLeadItems(metadata));
  items.push({ kind: 'close', name: 'metadata' }, { kind: 'blank' }, { kind: 'open', name: 'data' });

  items.push({ kind: 'open', name: 'stateVector' });
  comments(state.comments);
  kw('EPOCH', state.epoch);
  ['X', 'Y', 'Z'].forEach((k, i) => kw(k, fixed(state.positionKm[i], o.positionDecimals), 'km'));
  ['X_DOT', 'Y_DOT', 'Z_DOT'].forEach((k, i) => kw(k, fixed(state.velocityKmS[i], o.velocityDecimals), 'km/s'));
  items.push({ kind: 'close', name: 'stateVector' }, { kind: 'blank' });

  if (opm.keplerian) {
    const k = opm.keplerian;
    items.push({ kind: 'open', name: 'keplerianElements' });
    comments(k.comments);
    kw('SEMI_MAJOR_AXIS', fixed(k.semiMajorAxisKm, o.positionDecimals), 'km');
    kw('ECCENTRICITY', fixed(k.eccentricity, 12));
    kw('INCLINATION', fixed(k.inclinationDeg, 10), 'deg');
    kw('RA_OF_ASC_NODE', fixed(k.raOfAscNodeDeg, 10), 'deg');
    kw('ARG_OF_PERICENTER', fixed(k.argOfPericenterDeg, 10), 'deg');
    kw(k.anomaly.kind === 'mean' ? 'MEAN_ANOMALY' : 'TRUE_ANOMALY', fixed(k.anomaly.deg, 10), 'deg');
    kw('GM', fixed(k.gmKm3S2, 6), 'km**3/s**2');
    items.push({ kind: 'close', name: 'keplerianElements' }, { kind: 'blank' });
  }
  if (opm.spacecraft) {
    const s = opm.spacecraft;
    items.push({ kind: 'open', name: 'spacecraftParameters' });
    comments(s.comments);
    if (s.massKg !== undefined) kw('MASS', fixed(s.massKg, 3), 'kg');
    if (s.solarRadAreaM2 !== undefined) kw('SOLAR_RAD_AREA', fixed(s.solarRadAreaM2, 6), 'm**2');
    if (s.solarRadCoeff !== undefined) kw('SOLAR_RAD_COEFF', fixed(s.solarRadCoeff, 6));
    if (s.dragAreaM2 !== undefined) kw('DRAG_AREA', fixed(s.dragAreaM2, 6), 'm**2');
    if (s.dragCoeff !== undefined) kw('DRAG_COEFF', fixed(s.dragCoeff, 6));
    items.push({ kind: 'close', name: 'spacecraftParameters' }, { kind: 'blank' });
  }
  if (opm.covariance) {
    const c = opm.covariance;
    items.push({ kind: 'open', name: 'covarianceMatrix' });
    comments(c.comments);
    if (c.covRefFrame !== undefined) kw('COV_REF_FRAME', c.covRefFrame);
    items.push({ kind: 'covariance', rows: false, values: lowerTriangle(c.matrix).map((v) => formatExponent(v, o.covarianceDigits)) });
    items.push({ kind: 'close', name: 'covarianceMatrix' }, { kind: 'blank' });
  }
  for (const m of opm.maneuvers) {
    items.push({ kind: 'open', name: 'maneuverParameters' });
    comments(m.comments);
    kw('MAN_EPOCH_IGNITION', m.epochIgnition);
    kw('MAN_DURATION', fixed(m.durationS, 3), 's');
    kw('MAN_DELTA_MASS', fixed(m.deltaMassKg, 6), 'kg');
    kw('MAN_REF_FRAME', m.manRefFrame);
    ['MAN_DV_1', 'MAN_DV_2', 'MAN_DV_3'].forEach((k, i) => kw(k, fixed(m.deltaVKmS[i], o.velocityDecimals), 'km/s'));
    items.push({ kind: 'close', name: 'maneuverParameters' }, { kind: 'blank' });
  }
  if (opm.userDefined.length > 0) {
    items.push({ kind: 'open', name: 'userDefinedParameters' });
    for (const [name, value] of opm.userDefined) kw(`USER_DEFINED_${name}`, value);
    items.push({ kind: 'close', name: 'userDefinedParameters' });
  }
  items.push({ kind: 'close', name: 'data' }, { kind: 'close', name: 'segment' }, { kind: 'close', name: 'body' });
  return o.encoding === 'xml' ? renderXml('opm', header.version, items) : renderKvn(trimBlank(items));
}

/** Drops a trailing blank line so the KVN ends with its last keyword. */
function trimBlank(items: Item[]): Item[] {
  const out = items.filter((item, i) => !(item.kind === 'blank' && items.slice(i + 1).every((x) => x.kind !== 'keyword'
    && x.kind !== 'comment' && x.kind !== 'state' && x.kind !== 'covariance')));
  return out;
}
