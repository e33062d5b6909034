/**
 * CSV tables (RFC 4180): a header row that names units, one row per line or sample. Numbers keep
 * full precision (shortest round-trip form).
 */
export type Cell = string | number | boolean | undefined | null;

const quote = (v: Cell): string => {
  if (v === undefined || v === null) return '';
  const s = typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};

/** A CSV document from a header and rows (CRLF line ends, as RFC 4180 asks). */
export function toCsv(header: readonly string[], rows: Iterable<readonly Cell[]>): string {
  const out = [header.map(quote).join(',')];
  for (const r of rows) out.push(r.map(quote).join(','));
  return `${out.join('\r\n')}\r\n`;
}
