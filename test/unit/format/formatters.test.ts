// Every formatter people read from, on the values that are not ordinary numbers: zero of either sign,
// ±∞, NaN, subnormals and the ends of double range (IEEE 754 binary64). None may show the words a
// JavaScript number turns into (NaN, Infinity), `undefined`, or an object.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatRootHz } from '../../../shared/src/format/root';
import {
  formatDcGain,
  formatGain,
  formatPercent,
  formatRatio,
  formatSlewRate,
  formatTolerance,
} from '../../../shared/src/format/quantities';
import { formatDb, formatDeg, formatHz, formatSi, roundSignificant } from '../../../shared/src/format/si';
import {
  DC_GAIN_UNBOUNDED,
  DC_GAIN_ZERO,
  fixedNumber,
  NOT_COMPUTED,
  plainNumber,
} from '../../../shared/src/format/special';

const FORMATTERS: Record<string, (x: number) => string> = {
  formatSi: (x) => formatSi(x, 'F'),
  formatSiOhm: (x) => formatSi(x, 'ohm', 4),
  formatHz: (x) => formatHz(x),
  formatDeg,
  formatDb,
  formatPercent: (x) => formatPercent(x),
  formatTolerance,
  formatRatio: (x) => formatRatio(x),
  formatGain: (x) => formatGain(x),
  formatSlewRate,
  formatDcGain,
  formatRootHzRe: (x) => formatRootHz({ re: x, im: 0 }),
  formatRootHzPair: (x) => formatRootHz({ re: -1, im: x }),
  plainNumber: (x) => (Number.isFinite(x) ? plainNumber(x) : 'skipped'),
  fixedNumber: (x) => (Number.isFinite(x) ? fixedNumber(x, 1) : 'skipped'),
};

// IEEE 754 binary64: smallest subnormal 2^-1074 ≈ 4.94e-324, largest finite (2 − 2^-52)·2^1023 ≈ 1.80e308.
const SPECIAL = [
  0,
  -0,
  Infinity,
  -Infinity,
  NaN,
  Number.MIN_VALUE,
  -Number.MIN_VALUE,
  2.2250738585072014e-308,
  1e-320,
  Number.MAX_VALUE,
  -Number.MAX_VALUE,
  1e308,
  -1e308,
  1e-308,
  -1e-308,
  1e300,
  1e-300,
  -4e-5,
  -0.04,
  999.9999,
];

const FORBIDDEN = /NaN|Infinity|undefined|\[object|null/;

const check = (name: string, f: (x: number) => string, x: number) => {
  const text = f(x);
  expect(typeof text, `${name}(${x})`).toBe('string');
  expect(text.length, `${name}(${x})`).toBeGreaterThan(0);
  expect(text, `${name}(${x})`).not.toMatch(FORBIDDEN);
  // A signed zero or a value that rounds to zero never shows a minus sign.
  expect(text, `${name}(${x})`).not.toMatch(/^[-−]0(\.0*)?( |°|$)/);
};

describe('formatters on values that are not ordinary numbers', () => {
  it.each(Object.entries(FORMATTERS))('%s: special values come out in words or plain digits', (name, f) => {
    for (const x of SPECIAL) check(name, f, x);
  });

  it('every formatter on arbitrary doubles (including subnormals, ±0, ±∞, NaN)', () => {
    fc.assert(
      fc.property(fc.double(), (x) => {
        for (const [name, f] of Object.entries(FORMATTERS)) check(name, f, x);
      }),
      { numRuns: 2000 },
    );
  });

  it('names the exact states of a DC gain in words, one wording everywhere', () => {
    expect(formatDcGain(0)).toBe(DC_GAIN_ZERO);
    expect(formatDcGain(-0)).toBe(DC_GAIN_ZERO);
    expect(formatDcGain(Infinity)).toBe(DC_GAIN_UNBOUNDED);
    expect(formatDcGain(-Infinity)).toBe(DC_GAIN_UNBOUNDED);
    expect(formatDcGain(NaN)).toBe(NOT_COMPUTED);
    for (const f of Object.values(FORMATTERS)) expect([NOT_COMPUTED, 'skipped']).toContain(f(NaN));
  });
});

describe('formatters on ordinary values', () => {
  it('uses SI prefixes (BIPM SI brochure, 9th ed., table 7)', () => {
    expect(formatSi(1.1e-12, 'F')).toBe('1.1 pF');
    expect(formatSi(2.2e-3, 'S')).toBe('2.2 mS');
    expect(formatSi(-4.7e3, 'ohm')).toBe('-4.7 kohm');
    expect(formatSi(999.9e9, 'Hz')).toBe('1 THz');
    expect(formatSi(1e-18, 'F')).toBe('1 aF');
  });

  it('writes values beyond the prefixes with an exponent that reads back as the same number', () => {
    for (const x of [1e308, 4.94e-324, 1e-20, 2.5e16, -3.3e-25]) {
      const text = formatSi(x, 'F');
      expect(text).toMatch(/^-?[0-9.]+e-?[0-9]+ F$/);
      // Three significant digits of the value (the definition of the rounding asked for).
      expect(Number(text.split(' ')[0])).toBe(Number(x.toPrecision(3)));
    }
  });

  it('gives decibels of a gain as 20·log10|A| (definition of the decibel for a voltage ratio)', () => {
    expect(formatDcGain(1000)).toBe('60.0 dB');
    expect(formatDcGain(-1e5)).toBe('100.0 dB');
    expect(formatDb(-0.04)).toBe('0.0 dB');
  });

  it('gives percentages, tolerances, ratios and slew rates in their usual units', () => {
    expect(formatPercent(0.1234)).toBe('12.3 %');
    expect(formatTolerance(0.001)).toBe('0.1 %');
    expect(formatRatio(3.5)).toBe('3.5 ×');
    // 10 µA into 2.5 pF is 4 V/µs (I = C·dV/dt).
    expect(formatSlewRate(10e-6 / 2.5e-12)).toBe('4 V/µs');
    expect(formatDeg(61.44)).toBe('61.4°');
    expect(roundSignificant(123456)).toBe(123000);
  });
});
