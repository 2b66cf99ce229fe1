/**
 * Formatting for numbers, lengths (Å), point groups and dates, shared by every page so that
 * one quantity always reads the same way. Numbers are shown in JetBrains Mono (`.num`).
 */

const NBSP = '\u00a0';

/** A length in Å with a fixed number of decimals, e.g. `0.0123 Å`; `—` for null. */
export function formatAngstrom(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const abs = Math.abs(value);
  // Very small residuals (after a snap, ~1e-12 Å) read better in scientific notation.
  if (abs !== 0 && abs < 10 ** -digits) return `${value.toExponential(1)}${NBSP}Å`;
  return `${value.toFixed(digits)}${NBSP}Å`;
}

/** A plain number with a fixed number of decimals; `—` for null. */
export function formatDecimal(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return value.toFixed(digits);
}

const integer = new Intl.NumberFormat('en-GB');
/** A count with thousands separators: `12,345`. */
export function formatCount(value: number): string {
  return integer.format(value);
}

/** Percentage of done over total, 0–100, rounded down so 100 % means finished. */
export function percent(done: number, total: number): number {
  if (total <= 0) return 0;
  return Math.max(0, Math.min(100, Math.floor((done / total) * 100)));
}

/**
 * Splits a Schoenflies symbol written as plain text (`C2v`, `D∞h`, `Td`, `S4`, `Cs`, `Ih`, `O`)
 * into its capital letter and its subscript, for rendering as C<sub>2v</sub>.
 */
export function splitGroup(group: string): { letter: string; subscript: string } {
  const trimmed = group.trim();
  return { letter: trimmed.slice(0, 1), subscript: trimmed.slice(1) };
}

/** How a screen reader should say a group: "C 2 v" reads better than "C2v" as one word. */
export function spokenGroup(group: string): string {
  const { letter, subscript } = splitGroup(group);
  const parts = (subscript.match(/\d+|./gu) ?? []).map((t) => (t === '∞' ? 'infinity' : t));
  return [letter, ...parts].join(' ');
}

const dateTime = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short' });
const dateOnly = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium' });

/** `12 Mar 2026, 14:05` in the browser's time zone; `—` for null. */
export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? '—' : dateTime.format(d);
}

/** `12 Mar 2026`; `—` for null. */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return '—';
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? '—' : dateOnly.format(d);
}

const relative = new Intl.RelativeTimeFormat('en-GB', { numeric: 'auto' });
/** `3 minutes ago`, `yesterday`; falls back to the date beyond a week. */
export function formatRelative(iso: string | null | undefined, now: number = Date.now()): string {
  if (!iso) return '—';
  const t = new Date(iso).getTime();
  if (Number.isNaN(t)) return '—';
  const seconds = Math.round((t - now) / 1000);
  const abs = Math.abs(seconds);
  if (abs < 45) return 'just now';
  if (abs < 3600) return relative.format(Math.round(seconds / 60), 'minute');
  if (abs < 86_400) return relative.format(Math.round(seconds / 3600), 'hour');
  if (abs < 7 * 86_400) return relative.format(Math.round(seconds / 86_400), 'day');
  return formatDate(iso);
}

/** Bytes as `12.3 MB`. */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  const units = ['KB', 'MB', 'GB'];
  let value = bytes / 1024;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit += 1;
  }
  return `${value.toFixed(value < 10 ? 1 : 0)} ${units[unit]}`;
}

/** `1 structure`, `3 structures`. */
export function plural(count: number, one: string, many = `${one}s`): string {
  return `${formatCount(count)} ${count === 1 ? one : many}`;
}
