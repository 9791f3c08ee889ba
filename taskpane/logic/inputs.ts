/**
 * Reading what people type into the panel's fields: plain numbers ("12,000", "0.5") and percentages
 * ("4%", or "4" in a field labelled in percent). Pure functions.
 */

/**
 * Parse a number as typed: spaces and thousands commas allowed, a trailing "%" divides by 100.
 * Cost O(length). Returns NaN for anything else (the caller says what is wrong).
 * @example parseNumber("12,000") //=> 12000; parseNumber("4.5%") //=> 0.045
 */
export function parseNumber(text: string): number {
  const cleaned = text.trim().replace(/[\s\u00a0]/g, '').replace(/,(?=\d{3}(\D|$))/g, '');
  if (cleaned === '') return Number.NaN;
  const percent = cleaned.endsWith('%');
  const body = percent ? cleaned.slice(0, -1) : cleaned;
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(body)) return Number.NaN;
  const value = Number(body);
  return percent ? value / 100 : value;
}

/**
 * Parse a field labelled in percent: "4" and "4%" both mean 0.04. Cost O(length). NaN when not a number.
 * @example parsePercent("4") //=> 0.04; parsePercent("4%") //=> 0.04
 */
export function parsePercent(text: string): number {
  const trimmed = text.trim();
  if (trimmed.endsWith('%')) return parseNumber(trimmed);
  const value = parseNumber(trimmed);
  return value / 100;
}

/**
 * Show a fraction as a percentage with enough digits for small rates. Cost O(1).
 * @example formatPercent(0.0412) //=> "4.12%"; formatPercent(0.000123) //=> "0.0123%"
 */
export function formatPercent(fraction: number): string {
  if (!Number.isFinite(fraction)) return '—';
  const pct = fraction * 100;
  const abs = Math.abs(pct);
  const digits = abs === 0 ? 0 : abs >= 10 ? 1 : abs >= 1 ? 2 : Math.min(6, 1 - Math.floor(Math.log10(abs)) + 1);
  return `${pct.toFixed(digits)}%`;
}

/**
 * Show a count with thousands separators. Cost O(digits).
 * @example formatCount(31234) //=> "31,234"
 */
export function formatCount(n: number): string {
  return Number.isFinite(n) ? Math.round(n).toLocaleString('en-US') : '—';
}
