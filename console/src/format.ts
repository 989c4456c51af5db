/** Number and time formatting for tables (fixed decimals, thin grouping), never locale-dependent. */

/** `1234567.891` → `1 234 567.89` (narrow no-break space as the thousands separator). */
export function fixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const [int, frac] = Math.abs(value).toFixed(decimals).split('.');
  const grouped = int.replace(/\B(?=(\d{3})+(?!\d))/g, '\u202f');
  const sign = value < 0 && Number(value.toFixed(decimals)) !== 0 ? '−' : '';
  return sign + grouped + (frac !== undefined ? `.${frac}` : '');
}

/** Scientific notation for very small or large magnitudes, fixed otherwise. */
export function sig(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const a = Math.abs(value);
  if (a !== 0 && (a < 1e-3 || a >= 1e7)) return value.toExponential(digits - 1).replace('-', '−');
  return fixed(value, Math.max(0, digits - 1 - Math.floor(Math.log10(a || 1))));
}

/** km/s → m/s with 3 decimals (mm/s resolution). */
export function kmsToMs(value: number): string {
  return fixed(value * 1000, 3);
}

/** ISO time → `2026-12-02 01:23:45 UTC`. */
export function isoShort(iso: string | null | undefined): string {
  if (!iso) return '—';
  return iso.replace('T', ' ').replace(/\.\d+Z$/, 'Z').replace(/Z$/, ' UTC');
}

/** A plan epoch as a person reads it: UTC beside TDB (TDB alone before 1972, where UTC has no
 * whole-second offset). */
export function epochText(e: { utc: string | null; tdb: string }): string {
  return e.utc ? `${isoShort(e.utc)} · ${e.tdb.replace('T', ' ')}` : e.tdb.replace('T', ' ');
}

/** Seconds → `2 d 03:04:05` or `160.4 s`. */
export function duration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return '—';
  if (Math.abs(seconds) < 600) return `${fixed(seconds, 1)} s`;
  const d = Math.floor(seconds / 86400);
  const rest = seconds - d * 86400;
  const hh = String(Math.floor(rest / 3600)).padStart(2, '0');
  const mm = String(Math.floor((rest % 3600) / 60)).padStart(2, '0');
  const ss = String(Math.floor(rest % 60)).padStart(2, '0');
  return `${d > 0 ? `${d} d ` : ''}${hh}:${mm}:${ss}`;
}
