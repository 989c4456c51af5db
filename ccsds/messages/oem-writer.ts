/**
 * Orbit Ephemeris Message writer (CCSDS 502.0-B section 5), KVN or XML: per segment the metadata,
 * the ephemeris lines and, when present, the covariance matrices. Frame names the readers would refuse are
 * refused before anything is written (InvalidInputError naming the field).
 */
import { lowerTriangle } from './covariance.ts';
import { assertWritableFrame } from './frames.ts';
import { headerItems, metadataLeadItems } from './header-items.ts';
import type { Oem } from './odm-types.ts';
import { type Item, renderKvn, renderXml } from '../syntax/render.ts';
import { formatExponent, formatFixed } from '../syntax/values.ts';
import { type OdmWriteOptions, writeOptions } from './write-options.ts';

const STATE_NAMES = ['EPOCH', 'X', 'Y', 'Z', 'X_DOT', 'Y_DOT', 'Z_DOT', 'X_DDOT', 'Y_DDOT', 'Z_DDOT'] as const;
const STATE_UNITS = [undefined, 'km', 'km', 'km', 'km/s', 'km/s', 'km/s', 'km/s**2', 'km/s**2', 'km/s**2'] as const;

/** Writes an OEM as KVN (default) or XML text. */
export function writeOem(oem: Oem, options?: OdmWriteOptions): string {
  const o = writeOptions(options);
  const items: Item[] = [];
  const kw = (keyword: string, value: string): void => { items.push({ kind: 'keyword', keyword, value }); };
  const comments = (list: readonly string[]): void => list.forEach((text) => items.push({ kind: 'comment', text }));
  const { header } = oem;
  oem.segments.forEach((segment, k) => {
    assertWritableFrame(`segments[${k}].metadata.refFrame`, segment.metadata.refFrame, segment.metadata.centre, false);
    segment.covariances.forEach((c, i) => {
      if (c.covRefFrame !== undefined) assertWritableFrame(`segments[${k}].covariances[${i}].covRefFrame`, c.covRefFrame, segment.metadata.centre, true);
    });
  });
  items.push(...headerItems('CCSDS_OEM_VERS', header, o.encoding));
  items.push({ kind: 'open', name: 'body' });
  for (const segment of oem.segments) {
    const m = segment.metadata;
    items.push({ kind: 'blank' }, { kind: 'open', name: 'segment' }, { kind: 'open', name: 'metadata', kvn: 'META_START' });
    items.push(...metadataLeadItems(m));
    kw('START_TIME', m.startTime);
    if (m.useableStartTime !== undefined) kw('USEABLE_START_TIME', m.useableStartTime);
    if (m.useableStopTime !== undefined) kw('USEABLE_STOP_TIME', m.useableStopTime);
    kw('STOP_TIME', m.stopTime);
    if (m.interpolation !== undefined) kw('INTERPOLATION', m.interpolation);
    if (m.interpolationDegree !== undefined) kw('INTERPOLATION_DEGREE', String(m.interpolationDegree));
    items.push({ kind: 'close', name: 'metadata', kvn: 'META_STOP' }, { kind: 'blank' }, { kind: 'open', name: 'data' });
    comments(segment.dataComments);
    for (const s of segment.states) {
      const fields = [s.epoch,
        ...s.positionKm.map((v) => formatFixed(v, o.positionDecimals)),
        ...s.velocityKmS.map((v) => formatFixed(v, o.velocityDecimals)),
        ...(s.accelerationKmS2 ?? []).map((v) => formatFixed(v, o.accelerationDecimals))];
      items.push({ kind: 'state', names: STATE_NAMES, units: STATE_UNITS, fields });
    }
    if (segment.covariances.length > 0) {
      items.push({ kind: 'blank' }, { kind: 'open', name: '', kvn: 'COVARIANCE_START' });
      for (const c of segment.covariances) {
        items.push({ kind: 'open', name: 'covarianceMatrix' });
        comments(c.comments);
        kw('EPOCH', c.epoch);
        if (c.covRefFrame !== undefined) kw('COV_REF_FRAME', c.covRefFrame);
        items.push({
          kind: 'covariance', rows: true,
          values: lowerTriangle(c.matrix).map((v) => formatExponent(v, o.covarianceDigits)),
        });
        items.push({ kind: 'close', name: 'covarianceMatrix' });
      }
      items.push({ kind: 'close', name: '', kvn: 'COVARIANCE_STOP' });
    }
    items.push({ kind: 'close', name: 'data' }, { kind: 'close', name: 'segment' });
  }
  items.push({ kind: 'close', name: 'body' });
  return o.encoding === 'xml' ? renderXml('oem', header.version, items) : renderKvn(items);
}
