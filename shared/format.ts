/**
 * The one way Scorecourt writes numbers and dates: the pages (src/lib/format.ts re-exports this
 * file), the command line, the verdict's words, the e-mails and the demo's texts all format
 * through these functions, so a Gini, a p-value or a bad rate reads the same wherever it appears.
 *
 * Conventions (docs/design.md, "How numbers are written"):
 * - Gini, AUC, KS, rates and shares arrive as fractions (0.4213); Gini and KS are shown in points
 *   (42.1), rates and shares as percentages (3.1%).
 * - Differences are signed with a real minus sign (U+2212) and a plus sign; a difference that
 *   rounds to zero has no sign ("0.0").
 * - A value that is missing or undefined for the data (null, undefined, NaN, ±Infinity) is "—".
 * - p-values: in tables three significant digits ("0.0421"), in sentences two without trailing
 *   zeros ("p = 0.042"); below 0.001 in scientific notation with a superscript exponent
 *   ("3.2 × 10⁻⁴"); a p that underflowed to 0 is "< 1 × 10⁻³⁰⁰".
 * - Dates in API bodies and files: ISO 8601 in UTC (`iso`); on pages "3 Dec 2025".
 */

export const MISSING = '—';
export const MINUS = '\u2212';

type Maybe = number | null | undefined;

function isNumber(value: Maybe): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/** Replaces every ASCII hyphen-minus that Intl or toFixed writes with a real minus sign. */
function realMinus(text: string): string {
  return text.replace(/-/g, MINUS);
}

/**
 * A number with a fixed number of decimals and a real minus sign; never "-0.0": a value that
 * rounds to zero loses its sign. 2.3456 → "2.346" (3 digits), −0.00004 → "0.000".
 */
export function formatFixed(value: number, digits: number): string {
  const text = value.toFixed(digits);
  return Number(text) === 0 ? text.replace('-', '') : realMinus(text);
}

function signed(value: number, digits: number): string {
  const text = formatFixed(value, digits);
  if (Number(text.replace(MINUS, '-')) === 0) return text;
  return value > 0 ? `+${text}` : text;
}

const grouped = new Map<number, Intl.NumberFormat>();
function groupedFormat(digits: number): Intl.NumberFormat {
  let format = grouped.get(digits);
  if (!format) {
    format = new Intl.NumberFormat('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits });
    grouped.set(digits, format);
  }
  return format;
}

// --- model quality ------------------------------------------------------------------------

/** Gini (a fraction) in points with one decimal: 0.4213 → "42.1". */
export function formatGini(gini: Maybe): string {
  return isNumber(gini) ? formatFixed(gini * 100, 1) : MISSING;
}

/** A Gini difference in points, signed: 0.041 → "+4.1", −0.003 → "−0.3". */
export function formatGiniDelta(delta: Maybe): string {
  return isNumber(delta) ? signed(delta * 100, 1) : MISSING;
}

/** AUC with three decimals: 0.71063 → "0.711". */
export function formatAuc(auc: Maybe): string {
  return isNumber(auc) ? formatFixed(auc, 3) : MISSING;
}

/** An AUC difference, signed, three decimals: 0.0205 → "+0.021". */
export function formatAucDelta(delta: Maybe): string {
  return isNumber(delta) ? signed(delta, 3) : MISSING;
}

/** KS (a fraction) in points with one decimal: 0.3312 → "33.1". */
export function formatKs(ks: Maybe): string {
  return isNumber(ks) ? formatFixed(ks * 100, 1) : MISSING;
}

/** A KS difference in points, signed: 0.012 → "+1.2". */
export function formatKsDelta(delta: Maybe): string {
  return isNumber(delta) ? signed(delta * 100, 1) : MISSING;
}

// --- p-values -----------------------------------------------------------------------------

const SUPERSCRIPT: Record<string, string> = {
  '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '-': '⁻',
};

function superscript(exponent: number): string {
  return String(exponent).replace(/[-0-9]/g, (char) => SUPERSCRIPT[char] ?? char);
}

/** Below this a p-value is written in scientific notation. */
const P_SCIENTIFIC_BELOW = 0.001;
/** Smaller than any p a double can carry with meaning; an exact 0 is reported as "below" it. */
const P_FLOOR_EXPONENT = -300;

/** How a p-value is written: significant digits at or above 0.001, and whether trailing zeros go. */
export interface PValueStyle {
  /** Significant digits at or above 0.001 (default 3: "0.0421", "0.500"). */
  significant?: number;
  /** Drop trailing zeros: 0.5 → "0.5" rather than "0.50" (default false). */
  trimZeros?: boolean;
}

/**
 * A p-value: at or above 0.001 to three significant digits ("0.0421", "0.500"); below 0.001 in
 * scientific notation with two significant digits and a superscript exponent ("3.2 × 10⁻⁴",
 * "1.0 × 10⁻³⁰⁰"); exactly 1 → "1"; exactly 0 (a tail below double precision) → "< 1 × 10⁻³⁰⁰".
 * Values outside [0, 1] are not p-values and show as "—".
 */
export function formatPValue(p: Maybe, style: PValueStyle = {}): string {
  if (!isNumber(p) || p < 0 || p > 1) return MISSING;
  if (p === 1) return '1';
  if (p === 0) return `< 1 × 10${superscript(P_FLOOR_EXPONENT)}`;
  if (p >= P_SCIENTIFIC_BELOW) {
    const text = p.toPrecision(style.significant ?? 3);
    return style.trimZeros ? String(Number(text)) : text;
  }
  // toExponential does the rounding, so 0.000999 becomes "1.0e-3", never "10.0e-4".
  const [mantissa, exponent] = p.toExponential(1).split('e');
  return `${mantissa} × 10${superscript(Number(exponent))}`;
}

/** "p = 0.0421", "p = 3.2 × 10⁻⁴", or "p < 1 × 10⁻³⁰⁰" for a p that underflowed to 0. */
export function formatPStatement(p: Maybe, style: PValueStyle = {}): string {
  const text = formatPValue(p, style);
  if (text === MISSING) return `p ${MISSING}`;
  return text.startsWith('<') ? `p ${text}` : `p = ${text}`;
}

/**
 * A p-value in a sentence (the verdict, the e-mails, the demo's texts): two significant digits
 * without trailing zeros, "p = 0.018", "p = 1", "p = 3.0 × 10⁻⁴"; a p at or below 0 (underflow)
 * is "p < 1 × 10⁻³⁰⁰".
 */
export function formatPInWords(p: number): string {
  return formatPStatement(Math.max(p, 0), { significant: 2, trimZeros: true });
}

// --- rates, counts, amounts ---------------------------------------------------------------

/** A rate or share (a fraction) as a percentage: 0.0312 → "3.1%". */
export function formatPercent(share: Maybe, digits = 1): string {
  return isNumber(share) ? `${formatFixed(share * 100, digits)}%` : MISSING;
}

/** A setting given as a share, without trailing zeros: 0.7 → "70%", 0.725 → "72.5%". */
export function formatShare(share: Maybe, digits = 1): string {
  return isNumber(share) ? `${realMinus(String(Number((share * 100).toFixed(digits))))}%` : MISSING;
}

/** A difference of two rates in percentage points, signed: −0.033 → "−3.3 pp". */
export function formatPercentPointsDelta(delta: Maybe, digits = 1): string {
  return isNumber(delta) ? `${signed(delta * 100, digits)} pp` : MISSING;
}

/** A count with thousands separators: 1234567 → "1,234,567". */
export function formatCount(count: Maybe): string {
  return formatNumber(count, 0);
}

/** A plain number with thousands separators and a fixed number of decimals. */
export function formatNumber(value: Maybe, digits = 2): string {
  if (!isNumber(value)) return MISSING;
  const text = groupedFormat(digits).format(value);
  return Number(text.replace(/,/g, '')) === 0 ? text.replace('-', '') : realMinus(text);
}

/** A number to at most `digits` decimals without trailing zeros (an α, a threshold): 0.05 → "0.05", 0.1 → "0.1", 0.0125 → "0.013". */
export function formatDecimal(value: Maybe, digits: number): string {
  if (!isNumber(value)) return MISSING;
  const text = formatFixed(value, digits);
  return text.includes('.') ? text.replace(/\.?0+$/, '') : text;
}

/** A signed plain number (a z statistic, a difference of scores): 2.345 → "+2.35". */
export function formatSignedNumber(value: Maybe, digits = 2): string {
  if (!isNumber(value)) return MISSING;
  const text = formatNumber(value, digits);
  return value > 0 && Number(text.replace(/,/g, '')) !== 0 ? `+${text}` : text;
}

/**
 * A score in the model's own units: whole points as they are ("612"), other points with up to
 * two decimals ("612.45"), probabilities of default with four significant digits ("0.02134").
 */
export function formatScore(score: Maybe): string {
  if (!isNumber(score)) return MISSING;
  if (Number.isInteger(score)) return formatCount(score);
  if (Math.abs(score) >= 1) {
    return realMinus(new Intl.NumberFormat('en-US', { maximumFractionDigits: 2 }).format(score));
  }
  return realMinus(String(Number(score.toPrecision(4))));
}

/**
 * An amount of money. Holdouts carry amounts without a currency, so by default this is a plain
 * whole number with separators ("1,234,568"); with an ISO currency code it gets the symbol.
 * `compact` writes large totals briefly ("1.2M").
 */
export function formatMoney(amount: Maybe, options: { currency?: string; compact?: boolean } = {}): string {
  if (!isNumber(amount)) return MISSING;
  const format = new Intl.NumberFormat('en-US', {
    ...(options.currency ? { style: 'currency', currency: options.currency } : {}),
    ...(options.compact
      ? { notation: 'compact', maximumFractionDigits: 1 }
      : { maximumFractionDigits: 0, minimumFractionDigits: 0 }),
  });
  return realMinus(format.format(amount));
}

/** A file size: 1536 → "1.5 KB", 12_400_000 → "11.8 MB" (binary multiples). */
export function formatBytes(bytes: Maybe): string {
  if (!isNumber(bytes) || bytes < 0) return MISSING;
  if (bytes < 1024) return `${bytes} B`;
  const units = ['KB', 'MB', 'GB', 'TB'];
  let value = bytes / 1024;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit += 1;
  }
  return `${value.toFixed(1)} ${units[unit]}`;
}

// --- intervals ----------------------------------------------------------------------------

/**
 * An interval with the formatter of its quantity, unsigned: [0.02, 0.062] with formatGini →
 * "2.0 to 6.2"; [−0.012, 0.034] → "−1.2 to 3.4". A missing interval or bound is "—".
 */
export function formatInterval(
  interval: readonly [number, number] | null | undefined,
  format: (value: number) => string = formatGini,
): string {
  if (!interval || !isNumber(interval[0]) || !isNumber(interval[1])) return MISSING;
  return `${format(interval[0])} to ${format(interval[1])}`;
}

// --- dates and times ----------------------------------------------------------------------

type DateInput = string | number | Date | null | undefined;

function toDate(value: DateInput): Date | null {
  if (value === null || value === undefined || value === '') return null;
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

/** A calendar date: "3 Dec 2025". `timeZone` defaults to the reader's own. */
export function formatDate(value: DateInput, timeZone?: string): string {
  const date = toDate(value);
  if (!date) return MISSING;
  return new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone }).format(date);
}

/** A date and a 24-hour time: "3 Dec 2025, 14:05". */
export function formatDateTime(value: DateInput, timeZone?: string): string {
  const date = toDate(value);
  if (!date) return MISSING;
  return new Intl.DateTimeFormat('en-GB', {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
    timeZone,
  }).format(date);
}

/** Dates in API bodies, files and the `dateTime` attribute of <time>: ISO 8601 in UTC. */
export function iso(date: Date): string {
  return date.toISOString();
}

/** `iso`, keeping a missing date null. */
export function isoOrNull(date: Date | null): string | null {
  return date === null ? null : iso(date);
}

/** A date for machines and screen readers alike, for the `dateTime` attribute of <time>. */
export function isoDateTime(value: DateInput): string | undefined {
  const date = toDate(value);
  return date ? iso(date) : undefined;
}
