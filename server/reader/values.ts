/**
 * Cell values: numbers as written in CSV exports, and the usual spellings of "no value".
 * Numbers: what JavaScript's Number() reads, except hexadecimal/binary/octal literals and
 * Infinity; surrounding spaces allowed; a decimal comma (`0,125`) only in semicolon-separated
 * files, where it is the norm.
 */

/** Cells read as missing (after trimming, case-insensitive). */
export const MISSING_TOKENS = new Set(['', 'na', 'n/a', 'nan', 'null', 'none', '.', '-', '#n/a']);

export const MISSING = Symbol('missing');
export const INVALID = Symbol('invalid');
export type ParsedNumber = number | typeof MISSING | typeof INVALID;

const DECIMAL_COMMA = /^[+-]?\d+,\d+$/;

export function isMissing(cell: string): boolean {
  const length = cell.length;
  if (length === 0) return true;
  // The longest token has 4 characters: a longer cell without surrounding spaces is a value.
  if (length > 4 && cell.charCodeAt(0) > 32 && cell.charCodeAt(length - 1) > 32) return false;
  return MISSING_TOKENS.has(cell.trim().toLowerCase());
}

/** The cell without surrounding spaces; the same string when there are none (no allocation). */
export function trimCell(cell: string): string {
  const length = cell.length;
  return length > 0 && (cell.charCodeAt(0) <= 32 || cell.charCodeAt(length - 1) <= 32) ? cell.trim() : cell;
}

export function parseNumber(cell: string, decimalComma: boolean): ParsedNumber {
  const value = +cell;
  if (value - value === 0 && cell.length !== 0) {
    // Finite. Number() also reads '  ' as 0 and '0x1f' as 31: rule those out.
    if (value === 0 && cell.trim().length === 0) return MISSING;
    const c0 = cell.charCodeAt(0);
    if (c0 === 48 && cell.length > 2) {
      const c1 = cell.charCodeAt(1) | 32;
      if (c1 === 120 || c1 === 98 || c1 === 111) return INVALID;
    } else if (c0 <= 32 || c0 === 0xa0 || c0 === 0xfeff || c0 >= 0x1680) {
      // Spaces (Number() skips any Unicode space) before a literal such as ' 0x1f'.
      const trimmed = cell.trim();
      if (trimmed.length > 2 && trimmed.charCodeAt(0) === 48 && [120, 98, 111].includes(trimmed.charCodeAt(1) | 32)) return INVALID;
    }
    return value;
  }
  const trimmed = cell.trim();
  if (MISSING_TOKENS.has(trimmed.toLowerCase())) return MISSING;
  if (decimalComma && DECIMAL_COMMA.test(trimmed)) return +trimmed.replace(',', '.');
  return INVALID;
}

/**
 * A copy of a cell that does not point into the text it was cut from. V8 keeps substrings of 13
 * or more characters as views of their parent string, so keeping such an id would keep the whole
 * chunk of the file alive; concatenating and cutting again forces a copy of just the cell.
 */
export function detach(cell: string): string {
  return cell.length < 13 ? cell : (' ' + cell).slice(1);
}

/** Powers of ten exactly representable as doubles (10^0 … 10^22). */
const EXACT_POWERS = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * The value of text[from, to) when it is a plain decimal — an optional minus, digits, then
 * optionally a point and digits, at most 15 digits in all, nothing else — else NaN (the caller
 * then reads the cell with parseNumber). The digits make an integer below 10^15, exact in a
 * double, and 10^k (k ≤ 15) is exact too, so the one division is correctly rounded: the same
 * double as Number() gives for the text (Clinger 1990, "How to read floating point numbers
 * accurately", PLDI, the exact fast path). Cost: O(length), no string cut.
 */
export function plainDecimal(text: string, from: number, to: number): number {
  let at = from;
  if (at >= to) return NaN;
  let c = text.charCodeAt(at);
  const negative = c === 45;
  if (negative && ++at < to) c = text.charCodeAt(at);
  let mantissa = 0;
  let digits = 0;
  while (at < to && c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    if (++at < to) c = text.charCodeAt(at);
  }
  if (digits === 0) return NaN;
  let scale = 0;
  if (at < to) {
    if (c !== 46) return NaN;
    at++;
    if (at === to) return NaN;
    for (; at < to; at++) {
      c = text.charCodeAt(at);
      if (c < 48 || c > 57) return NaN;
      mantissa = mantissa * 10 + (c - 48);
      scale++;
    }
    digits += scale;
  }
  if (digits > 15) return NaN;
  const value = scale === 0 ? mantissa : mantissa / EXACT_POWERS[scale];
  return negative ? -value : value;
}

/** plainDecimal on ASCII text held as bytes: the value of bytes[from, to), or NaN (the same rules, the same double). */
export function plainDecimalBytes(bytes: Uint8Array, from: number, to: number): number {
  let at = from;
  if (at >= to) return NaN;
  let c = bytes[at];
  const negative = c === 45;
  if (negative && ++at < to) c = bytes[at];
  let mantissa = 0;
  let digits = 0;
  while (at < to && c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    if (++at < to) c = bytes[at];
  }
  if (digits === 0) return NaN;
  let scale = 0;
  if (at < to) {
    if (c !== 46) return NaN;
    at++;
    if (at === to) return NaN;
    for (; at < to; at++) {
      c = bytes[at];
      if (c < 48 || c > 57) return NaN;
      mantissa = mantissa * 10 + (c - 48);
      scale++;
    }
    digits += scale;
  }
  if (digits > 15) return NaN;
  const value = scale === 0 ? mantissa : mantissa / EXACT_POWERS[scale];
  return negative ? -value : value;
}

const char = String.fromCharCode;

/**
 * The string of ASCII bytes[from, to): a fresh string of its own (never a view of a larger one),
 * built from its character codes for the short cells an id usually is, else copied by Buffer.
 */
export function asciiString(bytes: Uint8Array, from: number, to: number): string {
  const b = bytes;
  const i = from;
  switch (to - from) {
    case 0:
      return '';
    case 1:
      return char(b[i]);
    case 2:
      return char(b[i], b[i + 1]);
    case 3:
      return char(b[i], b[i + 1], b[i + 2]);
    case 4:
      return char(b[i], b[i + 1], b[i + 2], b[i + 3]);
    case 5:
      return char(b[i], b[i + 1], b[i + 2], b[i + 3], b[i + 4]);
    case 6:
      return char(b[i], b[i + 1], b[i + 2], b[i + 3], b[i + 4], b[i + 5]);
    case 7:
      return char(b[i], b[i + 1], b[i + 2], b[i + 3], b[i + 4], b[i + 5], b[i + 6]);
    case 8:
      return char(b[i], b[i + 1], b[i + 2], b[i + 3], b[i + 4], b[i + 5], b[i + 6], b[i + 7]);
    case 9:
      return char(b[i], b[i + 1], b[i + 2], b[i + 3], b[i + 4], b[i + 5], b[i + 6], b[i + 7], b[i + 8]);
    case 10:
      return char(b[i], b[i + 1], b[i + 2], b[i + 3], b[i + 4], b[i + 5], b[i + 6], b[i + 7], b[i + 8], b[i + 9]);
    default:
      return Buffer.from(b.buffer, b.byteOffset + from, to - from).toString('latin1');
  }
}
