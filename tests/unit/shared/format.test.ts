import { describe, expect, it } from 'vitest';
import {
  MINUS,
  MISSING,
  formatAuc,
  formatAucDelta,
  formatBytes,
  formatCount,
  formatDate,
  formatDateTime,
  formatDecimal,
  formatFixed,
  formatGini,
  formatGiniDelta,
  formatInterval,
  formatKs,
  formatKsDelta,
  formatMoney,
  formatNumber,
  formatPInWords,
  formatPStatement,
  formatPValue,
  formatPercent,
  formatPercentPointsDelta,
  formatScore,
  formatShare,
  formatSignedNumber,
  iso,
  isoDateTime,
  isoOrNull,
} from '@shared/format';

// Expected strings are the project's own display rules (shared/format.ts header; docs/design.md,
// "How numbers are written"), worked by hand.

describe('missing values', () => {
  it('shows null, undefined, NaN and infinities as an em dash, never NaN', () => {
    for (const value of [null, undefined, Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      expect(formatGini(value)).toBe(MISSING);
      expect(formatGiniDelta(value)).toBe(MISSING);
      expect(formatAuc(value)).toBe(MISSING);
      expect(formatKs(value)).toBe(MISSING);
      expect(formatPValue(value)).toBe(MISSING);
      expect(formatPercent(value)).toBe(MISSING);
      expect(formatCount(value)).toBe(MISSING);
      expect(formatMoney(value)).toBe(MISSING);
      expect(formatScore(value)).toBe(MISSING);
    }
    expect(MISSING).toBe('—');
  });
});

describe('Gini, AUC and KS', () => {
  it('writes Gini in points with one decimal', () => {
    expect(formatGini(0.4213)).toBe('42.1');
    expect(formatGini(0.42159)).toBe('42.2');
    expect(formatGini(0)).toBe('0.0');
    expect(formatGini(1)).toBe('100.0');
    expect(formatGini(-0.05)).toBe(`${MINUS}5.0`);
  });

  it('signs Gini differences with a plus or a real minus sign', () => {
    expect(formatGiniDelta(0.041)).toBe('+4.1');
    expect(formatGiniDelta(-0.003)).toBe(`${MINUS}0.3`);
    expect(formatGiniDelta(-0.003)).not.toContain('-');
  });

  it('drops the sign of a difference that rounds to zero', () => {
    expect(formatGiniDelta(0)).toBe('0.0');
    expect(formatGiniDelta(-0.0004)).toBe('0.0');
    expect(formatGiniDelta(0.0004)).toBe('0.0');
    expect(formatGini(-0.0001)).toBe('0.0');
  });

  it('writes AUC with three decimals', () => {
    expect(formatAuc(0.71063)).toBe('0.711');
    expect(formatAuc(0.5)).toBe('0.500');
    expect(formatAucDelta(0.0205)).toBe('+0.021');
    expect(formatAucDelta(-0.0123)).toBe(`${MINUS}0.012`);
  });

  it('writes KS in points', () => {
    expect(formatKs(0.3312)).toBe('33.1');
    expect(formatKsDelta(0.012)).toBe('+1.2');
    expect(formatKsDelta(-0.0251)).toBe(`${MINUS}2.5`);
  });
});

describe('p-values', () => {
  it('writes p at or above 0.001 to three significant digits', () => {
    expect(formatPValue(0.04213)).toBe('0.0421');
    expect(formatPValue(0.5)).toBe('0.500');
    expect(formatPValue(0.001)).toBe('0.00100');
    expect(formatPValue(0.2468)).toBe('0.247');
  });

  it('writes p below 0.001 in scientific notation with a superscript exponent', () => {
    expect(formatPValue(0.00032)).toBe('3.2 × 10⁻⁴');
    expect(formatPValue(0.000319)).toBe('3.2 × 10⁻⁴');
    expect(formatPValue(1.234e-12)).toBe('1.2 × 10⁻¹²');
  });

  it('rounds across a power of ten without writing 10.0', () => {
    // 0.000999 to two significant digits is 1.0e-3.
    expect(formatPValue(0.000999)).toBe('1.0 × 10⁻³');
    expect(formatPValue(9.96e-8)).toBe('1.0 × 10⁻⁷');
  });

  it('keeps tiny p-values readable', () => {
    expect(formatPValue(1e-300)).toBe('1.0 × 10⁻³⁰⁰');
    expect(formatPValue(5e-324)).toBe('4.9 × 10⁻³²⁴'); // the smallest double is 4.94e-324
    expect(formatPValue(0)).toBe('< 1 × 10⁻³⁰⁰');
  });

  it('writes p = 1 as "1" and refuses values that are not probabilities', () => {
    expect(formatPValue(1)).toBe('1');
    expect(formatPValue(1.2)).toBe(MISSING);
    expect(formatPValue(-0.1)).toBe(MISSING);
  });

  it('writes p statements with "=" or "<"', () => {
    expect(formatPStatement(0.0003)).toBe('p = 3.0 × 10⁻⁴');
    expect(formatPStatement(0.0421)).toBe('p = 0.0421');
    expect(formatPStatement(0)).toBe('p < 1 × 10⁻³⁰⁰');
    expect(formatPStatement(null)).toBe(`p ${MISSING}`);
  });
});

describe('rates, counts and amounts', () => {
  it('writes rates and shares as percentages with one decimal', () => {
    expect(formatPercent(0.0312)).toBe('3.1%');
    expect(formatPercent(0.7)).toBe('70.0%');
    expect(formatPercent(1)).toBe('100.0%');
    expect(formatPercent(0.12345, 2)).toBe('12.35%');
  });

  it('writes differences of rates in signed percentage points', () => {
    expect(formatPercentPointsDelta(-0.033)).toBe(`${MINUS}3.3 pp`);
    expect(formatPercentPointsDelta(0.01)).toBe('+1.0 pp');
  });

  it('writes counts with thousands separators', () => {
    expect(formatCount(1234567)).toBe('1,234,567');
    expect(formatCount(812)).toBe('812');
    expect(formatCount(0)).toBe('0');
    expect(formatCount(-5000)).toBe(`${MINUS}5,000`);
    expect(formatCount(5_000_000)).toBe('5,000,000');
  });

  it('writes plain and signed numbers', () => {
    expect(formatNumber(1234.5678)).toBe('1,234.57');
    expect(formatNumber(-0.001)).toBe('0.00');
    expect(formatSignedNumber(2.345, 2)).toBe('+2.35');
    expect(formatSignedNumber(-1.5, 1)).toBe(`${MINUS}1.5`);
    expect(formatSignedNumber(0.001, 2)).toBe('0.00');
  });

  it('writes scores in their own units', () => {
    expect(formatScore(612)).toBe('612');
    expect(formatScore(612.456)).toBe('612.46');
    expect(formatScore(0.0213456)).toBe('0.02135');
    expect(formatScore(-12.5)).toBe(`${MINUS}12.5`);
  });

  it('writes money as whole amounts, with a currency when one is given', () => {
    expect(formatMoney(1234567.8)).toBe('1,234,568');
    expect(formatMoney(1234.5, { currency: 'USD' })).toBe('$1,235');
    expect(formatMoney(-250, { currency: 'EUR' })).toBe(`${MINUS}€250`);
    expect(formatMoney(1_234_567, { compact: true })).toBe('1.2M');
  });

  it('writes file sizes', () => {
    expect(formatBytes(512)).toBe('512 B');
    expect(formatBytes(1536)).toBe('1.5 KB');
    expect(formatBytes(12_400_000)).toBe('11.8 MB');
  });
});

describe('intervals', () => {
  it('joins bounds with "to", unsigned, with a real minus on a negative bound', () => {
    expect(formatInterval([0.02, 0.062])).toBe('2.0 to 6.2');
    expect(formatInterval([-0.012, 0.034])).toBe(`${MINUS}1.2 to 3.4`);
    expect(formatInterval([0.701, 0.733], formatAuc)).toBe('0.701 to 0.733');
    expect(formatInterval([0.031, 0.047], (value) => formatPercent(value))).toBe('3.1% to 4.7%');
  });

  it('shows a missing interval or bound as an em dash', () => {
    expect(formatInterval(null)).toBe(MISSING);
    expect(formatInterval([Number.NaN, 0.1])).toBe(MISSING);
  });
});

describe('dates and times', () => {
  it('writes dates and times day-first with a 24-hour clock', () => {
    expect(formatDate('2025-12-03T14:05:00Z', 'UTC')).toBe('3 Dec 2025');
    expect(formatDateTime('2025-12-03T14:05:00Z', 'UTC')).toBe('3 Dec 2025, 14:05');
    expect(formatDateTime('2025-12-03T00:30:00Z', 'UTC')).toBe('3 Dec 2025, 00:30');
  });

  it('shows a missing or unreadable date as an em dash', () => {
    expect(formatDate(null)).toBe(MISSING);
    expect(formatDate('not a date')).toBe(MISSING);
    expect(formatDateTime('')).toBe(MISSING);
  });
});

// --- the rules the server uses too (shared/format.ts): sentences, settings, fixed decimals, ISO dates ---

describe('p-values in sentences', () => {
  it('writes two significant digits without trailing zeros, as the verdict and the e-mails do', () => {
    // Computed by hand: 0.01834 → 0.018; 0.5 → "0.5" (not "0.50"); 0.996 rounds to 1.0 → "1".
    expect(formatPInWords(0.01834)).toBe('p = 0.018');
    expect(formatPInWords(0.5)).toBe('p = 0.5');
    expect(formatPInWords(0.996)).toBe('p = 1');
    expect(formatPInWords(1)).toBe('p = 1');
  });

  it('uses the same scientific notation and floor as the tables', () => {
    expect(formatPInWords(0.0003)).toBe('p = 3.0 × 10⁻⁴');
    expect(formatPInWords(4.1e-16)).toBe('p = 4.1 × 10⁻¹⁶');
    expect(formatPInWords(0)).toBe('p < 1 × 10⁻³⁰⁰');
    // A p computed as a tiny negative by rounding is an underflow, not "not a p-value".
    expect(formatPInWords(-1e-320)).toBe('p < 1 × 10⁻³⁰⁰');
  });

  it('takes the number of significant digits and the trimming as a style', () => {
    expect(formatPValue(0.04213, { significant: 2 })).toBe('0.042');
    expect(formatPValue(0.5, { significant: 2 })).toBe('0.50');
    expect(formatPValue(0.5, { significant: 2, trimZeros: true })).toBe('0.5');
    expect(formatPStatement(0.0421)).toBe('p = 0.0421');
  });
});

describe('settings given as shares, fixed decimals', () => {
  it('writes a share without trailing zeros: 0.7 → 70%, 0.725 → 72.5%', () => {
    expect(formatShare(0.7)).toBe('70%');
    expect(formatShare(0.725)).toBe('72.5%');
    expect(formatShare(0.05)).toBe('5%');
    expect(formatShare(null)).toBe(MISSING);
  });

  it('writes fixed decimals with a real minus and no negative zero', () => {
    expect(formatFixed(-5.2412, 3)).toBe(`${MINUS}5.241`);
    expect(formatFixed(8.05249, 3)).toBe('8.052');
    expect(formatFixed(-0.00004, 3)).toBe('0.000');
    expect(formatFixed(0.71063, 4)).toBe('0.7106');
  });

  it('writes an α or a threshold to at most so many decimals, without trailing zeros', () => {
    expect(formatDecimal(0.05, 3)).toBe('0.05');
    expect(formatDecimal(0.1, 3)).toBe('0.1');
    expect(formatDecimal(0.0125, 3)).toBe('0.013');
    expect(formatDecimal(2, 3)).toBe('2');
    expect(formatDecimal(100, 2)).toBe('100');
    expect(formatDecimal(10, 0)).toBe('10');
    expect(formatDecimal(-0.25, 3)).toBe(`${MINUS}0.25`);
    expect(formatDecimal(0.00004, 3)).toBe('0');
    expect(formatDecimal(Number.NaN, 3)).toBe('—');
  });
});

describe('ISO dates', () => {
  it('writes dates in API bodies and files as ISO 8601 in UTC, null kept null', () => {
    const date = new Date(Date.UTC(2025, 11, 3, 14, 5, 0, 120));
    expect(iso(date)).toBe('2025-12-03T14:05:00.120Z');
    expect(isoOrNull(date)).toBe('2025-12-03T14:05:00.120Z');
    expect(isoOrNull(null)).toBeNull();
    expect(isoDateTime('2025-12-03T14:05:00.120Z')).toBe('2025-12-03T14:05:00.120Z');
    expect(isoDateTime('not a date')).toBeUndefined();
  });
});
