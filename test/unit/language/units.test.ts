// Units, prefixes and dimensions. Expected values: SI prefixes and derived units as defined in the BIPM SI
// Brochure (9th ed.), tables 4 and 7; the ohm, siemens and farad expressed in V, A and s by definition.
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { lookupUnit, scaleLiteral, UNIT_SPELLINGS } from '../../../shared/src/language/unitTable';
import { wrap } from './marked';

/** The SI value and dimension name of a parameter written as `param x = <expr>`. */
function value(expr: string): { value: number; dimension: string } {
  const doc = parseDocument(wrap(`  param x = ${expr}\n  stage s gm = 1 mS rout = 1 Mohm`));
  expect(doc.diagnostics).toEqual([]);
  const p = doc.designs[0]!.nominal!.params[0]!;
  return { value: p.value, dimension: p.dimension };
}

describe('SI prefixes', () => {
  const table: [string, number][] = [
    ['a', -18],
    ['f', -15],
    ['p', -12],
    ['n', -9],
    ['u', -6],
    ['µ', -6], // U+00B5 micro sign
    ['μ', -6], // U+03BC Greek mu
    ['m', -3],
    ['k', 3],
    ['M', 6],
    ['G', 9],
    ['T', 12],
  ];
  for (const [prefix, exponent] of table) {
    it(`${prefix}F is 1e${exponent} F`, () => {
      // the double nearest 3·10^exponent, as the literal 3e<exponent> reads
      expect(value(`3 ${prefix}F`)).toEqual({ value: Number(`3e${exponent}`), dimension: 'F' });
    });
  }

  it('rounds once: 10 uA is the double nearest 1e-5, 1.1 pF the one nearest 1.1e-12', () => {
    expect(value('10 uA').value).toBe(1e-5);
    expect(value('1.1 pF').value).toBe(1.1e-12);
    expect(value('90 fF').value).toBe(9e-14);
    expect(scaleLiteral('2.5e3', -6)).toBe(2.5e-3);
    expect(scaleLiteral('.5', 3)).toBe(500);
  });

  it('distinguishes M (mega) from m (milli)', () => {
    expect(value('1 Mohm').value).toBe(1e6);
    expect(value('1 mohm').value).toBe(1e-3);
    expect(value('2 MS').value).toBe(2e6);
    expect(value('2 mS').value).toBe(2e-3);
    expect(value('2 ms')).toEqual({ value: 2e-3, dimension: 's' });
  });

  it('reads a prefix alone as a factor (1 M is mega)', () => {
    expect(value('1 M')).toEqual({ value: 1e6, dimension: '1' });
    expect(value('1 m')).toEqual({ value: 1e-3, dimension: '1' });
    const m = parseDocument(wrap('  stage s gm = 2.2 m rout = 1.8 M cap = 90 f')).designs[0]!.nominal!;
    expect([m.stages[0]!.gm, m.stages[0]!.rout, m.stages[0]!.cap]).toEqual([2.2e-3, 1.8e6, 90e-15]);
  });

  it('accepts a unit written against the number', () => {
    expect(value('1.1pF').value).toBe(1.1e-12);
    expect(value('5kohm').value).toBe(5e3);
  });
});

describe('units and their dimensions', () => {
  const cases: [string, number, string][] = [
    ['1 ohm', 1, 'ohm'],
    ['1 Ω', 1, 'ohm'], // U+03A9
    ['1 Ω', 1, 'ohm'], // U+2126 ohm sign
    ['4.7 kΩ', 4.7e3, 'ohm'],
    ['2 MΩ', 2e6, 'ohm'],
    ['3 S', 3, 'S'],
    ['3 A/V', 3, 'S'],
    ['3 mA/V', 3e-3, 'S'],
    ['2 A', 2, 'A'],
    ['2 V', 2, 'V'],
    ['2 s', 2, 's'],
    ['2 Hz', 2, 'Hz'],
    ['2 MHz', 2e6, 'Hz'],
    ['6 V/us', 6e6, 'V/s'],
    ['6 V/µs', 6e6, 'V/s'],
    ['6 V/s', 6, 'V/s'],
    ['6 mV/ns', 6e6, 'V/s'],
    ['60 deg', 60, 'deg'],
    ['60 °', 60, 'deg'],
    ['80 dB', 80, 'dB'],
    ['0.1 %', 1e-3, '1'],
    ['50 ppm', 5e-5, '1'],
    ['7', 7, '1'],
  ];
  for (const [text, v, dim] of cases) {
    it(`${text} → ${v} ${dim}`, () => {
      const r = value(text);
      expect(r.value).toBeCloseTo(v, 12 - Math.floor(Math.log10(Math.abs(v))));
      expect(r.dimension).toBe(dim);
    });
  }

  it('derives dimensions through expressions', () => {
    expect(value('1 / 2 mS').dimension).toBe('ohm'); // 1/S = ohm
    expect(value('1 V / 1 A').dimension).toBe('ohm');
    expect(value('1 A / 1 V').dimension).toBe('S');
    expect(value('1 mS / 1 pF').dimension).toBe('Hz'); // S/F = 1/s
    expect(value('1 kohm * 1 pF').dimension).toBe('s'); // RC is a time
    expect(value('10 uA / 1 pF').dimension).toBe('V/s'); // slew: I/C
    expect(value('(2 mS)^2').dimension).toBe('V^-2·A^2');
    expect(value('2^3')).toEqual({ value: 8, dimension: '1' });
    expect(value('-2^2').value).toBe(-4);
    expect(value('2^3^2').value).toBe(512); // right-associative
  });

  it('gives a plain number the unit its field implies', () => {
    const m = parseDocument(
      wrap(
        '  stage s gm = 0.002 rout = 1e6 cap = 1e-12 bias = 1e-5\n  load cap = 2e-12 res = 5e5\n  miller in -> s cc = 1e-12 rz = 100\n  feedback beta = 0.5\n  require ugf >= 1e6\n  require pm >= 60\n  require dcgain >= 80\n  require slew >= 1e6\n  require settle 0.001 within 1e-6\n  require zero >= 10\n  element res in gnd = 50',
      ),
    );
    expect(m.diagnostics).toEqual([]);
    const d = m.designs[0]!.nominal!;
    expect([d.stages[0]!.gm, d.stages[0]!.rout, d.stages[0]!.cap, d.stages[0]!.bias]).toEqual([
      0.002, 1e6, 1e-12, 1e-5,
    ]);
    expect(d.millers[0]!.rz).toBe(100);
    expect(d.feedback).toMatchObject({ kind: 'factor', beta: 0.5 });
    expect(d.requirements.map((r) => ('value' in r ? r.value : 'factor' in r ? r.factor : r.within))).toEqual(
      [1e6, 60, 80, 1e6, 1e-6, 10],
    );
    expect(d.elements[0]!.kind === 'res' && d.elements[0]!.value).toBe(50);
  });

  it('offers every unit spelling for completion', () => {
    for (const u of [
      'pF',
      'fF',
      'kohm',
      'Mohm',
      'kΩ',
      'uS',
      'mS',
      'µS',
      'uA',
      'MHz',
      'ns',
      'deg',
      'dB',
      '%',
      'ppm',
      'V/us',
      'A/V',
    ])
      expect(UNIT_SPELLINGS).toContain(u);
    for (const u of UNIT_SPELLINGS.filter((s) => !s.includes('/'))) expect(lookupUnit(u)).toBeDefined();
  });
});

describe('unit errors', () => {
  it('rejects a value of the wrong dimension in a field', () => {
    const doc = parseDocument(wrap('  stage s gm = 1 mS rout = 1.2 pF'));
    expect(doc.diagnostics.map((d) => [d.code, d.message])).toEqual([
      ['unit', '`rout` expects a resistance (ohm), but this is a capacitance (F).'],
    ]);
  });

  it('suggests the right case for a misspelt unit', () => {
    const msg = (u: string): string =>
      parseDocument(wrap(`  stage s gm = 1 mS rout = 1 Mohm\n  param x = 1 ${u}`)).diagnostics[0]!.message;
    expect(msg('Kohm')).toBe('Unknown unit `Kohm`. Did you mean `kohm`?');
    expect(msg('pf')).toBe('Unknown unit `pf`. Did you mean `pF`?');
    expect(msg('hz')).toBe('Unknown unit `hz`. Did you mean `Hz`?');
    expect(msg('xF')).toBe('Unknown unit `xF`. `x` is not an SI prefix (a f p n u µ m k M G T).');
    expect(msg('ugf')).toBe('Unknown unit `ugf`. Write `1 * ugf`.');
  });

  it('rejects mixing dimensions in sums and exponents', () => {
    const codes = (e: string): string[] =>
      parseDocument(wrap(`  stage s gm = 1 mS rout = 1 Mohm\n  param x = ${e}`)).diagnostics.map(
        (d) => d.message,
      );
    expect(codes('1 pF + 1 uS')).toEqual(['Cannot add a transconductance (S) to a capacitance (F).']);
    expect(codes('1 pF - 1')).toEqual(['Cannot subtract a plain number from a capacitance (F).']);
    expect(codes('2 ^ (1 pF)')).toEqual(['An exponent must be a plain number, not a capacitance (F).']);
    expect(codes('60 deg + 1 dB')).toEqual(['Cannot add a level in decibels (dB) to a phase (deg).']);
  });
});
