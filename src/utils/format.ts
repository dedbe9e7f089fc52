/** Display helpers: engineering units for frequencies, fixed decimals for delays and powers. */

export function formatHz(hz: number | null | undefined): string {
  if (hz == null) return '—';
  const units: [number, string][] = [[1e9, 'GHz'], [1e6, 'MHz'], [1e3, 'kHz'], [1, 'Hz']];
  const [scale, unit] = units.find(([s]) => Math.abs(hz) >= s) ?? [1, 'Hz'];
  return `${Number((hz / scale).toPrecision(6))} ${unit}`;
}

export function formatRange(min: number | null, max: number | null): string {
  if (min == null && max == null) return '—';
  return `${min == null ? 'DC' : formatHz(min)} – ${max == null ? '?' : formatHz(max)}`;
}

export const formatPs = (ps: number | null | undefined, digits = 1) => (ps == null ? '—' : `${ps.toFixed(digits)} ps`);
export const formatMm = (mm: number | null | undefined, digits = 1) => (mm == null ? '—' : `${mm.toFixed(digits)} mm`);
export const formatDb = (db: number | null | undefined) => (db == null ? '—' : `${Number(db.toFixed(2))} dB`);
export const formatDbm = (dbm: number | null | undefined) => (dbm == null ? '—' : `${dbm > 0 ? '+' : ''}${Number(dbm.toFixed(2))} dBm`);

/** A calendar date `YYYY-MM-DD` as the reader's locale writes it (the date itself is not shifted by zones). */
export function formatDate(date: string | null | undefined): string {
  if (!date) return '—';
  return new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeZone: 'UTC' }).format(new Date(`${date}T00:00:00Z`));
}

/** Parse a number typed in a form: empty → null, anything else → Number (NaN is refused by the schema). */
export function numberOrNull(value: unknown): number | null {
  if (value === '' || value == null) return null;
  return typeof value === 'number' ? value : Number(String(value).trim());
}
