// Units with powers, functions and the parallel operator, values at the limits of double precision, and the
// errors each gives. Reference values: mathjs (an independent unit-aware evaluator, a dev dependency), the
// SI Brochure (BIPM, 9th ed., §5.4.3: a prefix belongs to its unit, and a power applies to both, so
// 1 us^2 = (1e-6 s)^2), IEEE 754 binary64 limits, and hand computations written out beside each check.
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { MIN_NORMAL } from '../../../shared/src/language/doublePrecision';
import { parallel } from '../../../shared/src/language/expressionFunctions';
import { endsAfterNumber, lexLine } from '../../../shared/src/language/lexer';
import { ANALYSABLE_MAGNITUDE } from '../../../shared/src/language/valueRanges';
import { marked, wrap } from './marked';

const STAGE = '  stage s gm = 1 mS rout = 1 Mohm';

/** The SI value and dimension of `param x = <expr>`, which must parse without any diagnostic. */
function value(expr: string, extra = ''): { value: number; dimension: string } {
  const doc = parseDocument(wrap(`${extra}  param x = ${expr}\n${STAGE}`));
  expect(doc.diagnostics).toEqual([]);
  const p = doc.designs[0]!.nominal!.params.find((q) => q.name === 'x')!;
  return { value: p.value, dimension: p.dimension };
}

/** The diagnostics of a design body, without related information. */
function diagnostics(body: string): { code: string; severity: string; message: string }[] {
  return parseDocument(wrap(`${body}\n${STAGE}`)).diagnostics.map((d) => ({
    code: d.code,
    severity: d.severity,
    message: d.message,
  }));
}

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('a unit written with a power belongs to its number', () => {
  it('reads 50 uA/V^2 as 50 µA/V², not (50 µA/V)²', () => {
    const kp = value('50 uA/V^2');
    expect(kp.dimension).toBe('V^-2·A');
    // mathjs: evaluate('50 uA/V^2').toNumber('A/V^2')
    expect(rel(kp.value, math.evaluate('50 uA/V^2').toNumber('A/V^2'))).toBeLessThan(1e-15);
    expect(value('200 A/V^2').value).toBe(200);
  });

  it('reads reciprocal units: 0.04 /V, 0.04/V, 0.04 1/V and 0.04 V^-1 are all 0.04 per volt', () => {
    // mathjs: evaluate('0.04 / V') is 0.04 V^-1
    const ref = math.evaluate('0.04 / V').toNumber('V^-1');
    for (const text of ['0.04 /V', '0.04/V', '0.04 1/V', '0.04 V^-1', '0.04 V^−1']) {
      const r = value(text);
      expect(r.dimension, text).toBe('V^-1');
      expect(rel(r.value, ref), text).toBeLessThan(1e-15);
    }
  });

  it('raises the prefix with the unit (SI Brochure §5.4.3)', () => {
    // 1 us^2 = (1e-6 s)^2 = 1e-12 s^2; mathjs agrees
    expect(value('1 us^2')).toEqual({ value: 1e-12, dimension: 's^2' });
    expect(math.evaluate('1 us^2').toNumber('s^2')).toBeCloseTo(1e-12, 25);
    // 3 kV^2 = 3·(1e3 V)^2 = 3e6 V^2
    expect(value('3 kV^2')).toEqual({ value: 3e6, dimension: 'V^2' });
    expect(value('2 A^2/V').dimension).toBe('V^-1·A^2');
  });

  it('takes a power written with spaces as the unit’s too; parentheses raise the whole value', () => {
    expect(value('3 V ^ 2')).toEqual({ value: 3, dimension: 'V^2' });
    // (2 V)^2 = 4 V^2 by hand
    expect(value('(2 V)^2')).toEqual({ value: 4, dimension: 'V^2' });
  });

  it('keeps a spaced slash a division, so a name after it is still a name', () => {
    expect(value('2 / k', '  param k = 4\n').value).toBe(0.5);
    expect(value('1 / 2 mS').dimension).toBe('ohm');
  });

  it('builds gm = sqrt(2·kp·W/L·Id) as a transconductance (square-law MOSFET, e.g. Razavi, Design of Analog CMOS ICs, eq. 2.20)', () => {
    const text = wrap(
      [
        '  param kp = 200 uA/V^2',
        '  param W = 20',
        '  param L = 2',
        '  param Id = 100 uA',
        '  stage s gm = sqrt(2*kp*W/L*Id) rout = 1 Mohm',
      ].join('\n'),
    );
    const doc = parseDocument(text);
    expect(doc.diagnostics).toEqual([]);
    // mathjs: sqrt(2 * 200 uA/V^2 * 10 * 100 uA) = 0.632 mS
    const want = math.evaluate('sqrt(2 * 200 uA/V^2 * 10 * 100 uA)').toNumber('S');
    expect(rel(doc.designs[0]!.nominal!.stages[0]!.gm, want)).toBeLessThan(1e-14);
  });

  it('reports a power that is not a number at the unit', () => {
    const { text, ranges } = marked(wrap(`  param n = 2\n  param x = 3 V^⟦n⟧\n${STAGE}`));
    const [d] = parseDocument(text).diagnostics;
    expect(d).toMatchObject({ code: 'unit', range: ranges[0] });
    expect(d!.message).toContain('A unit’s power'.replace('’', "'"));
  });
});

describe('a dimension error points at the literals that caused it', () => {
  it('a kp written without its square: the error at gm names the literal 50 uA/V', () => {
    const { text, ranges } = marked(
      wrap('  param kp = ⟦50 uA/V⟧\n  stage s gm = sqrt(⟦2 * kp * 100 uA⟧) rout = 1 Mohm'),
    );
    const diags = parseDocument(text).diagnostics;
    expect(diags).toHaveLength(1);
    expect(diags[0]).toMatchObject({ code: 'unit', range: ranges[1] });
    expect(diags[0]!.message).toContain('`sqrt` needs a quantity whose unit has even powers');
    expect(diags[0]!.related).toContainEqual({
      range: ranges[0],
      message: '`50 uA/V` (in `kp`) is a transconductance (S)',
    });
  });

  it('a field of the wrong kind points at the unit literals of the parameters it uses', () => {
    const { text, ranges } = marked(wrap('  param c = ⟦2 pF⟧\n  stage s gm = 1 mS rout = ⟦c * 3⟧'));
    const [d] = parseDocument(text).diagnostics;
    expect(d).toMatchObject({
      code: 'unit',
      message: '`rout` expects a resistance (ohm), but this is a capacitance (F).',
      range: ranges[1],
      related: [{ range: ranges[0], message: '`2 pF` (in `c`) is a capacitance (F)' }],
    });
  });

  it('a sum of two kinds points at both literals', () => {
    const { text, ranges } = marked(wrap(`  param x = ⟦⟦1 pF⟧ + ⟦1 uS⟧⟧\n${STAGE}`));
    const [d] = parseDocument(text).diagnostics;
    expect(d!.range).toEqual(ranges[0]);
    expect(d!.related!.map((r) => r.range)).toEqual([ranges[1], ranges[2]]);
  });
});

describe('functions', () => {
  it('evaluates sqrt, min, max, abs and log10 (values by hand)', () => {
    expect(value('sqrt(16)').value).toBe(4);
    expect(value('sqrt(4 A^2)')).toEqual({ value: 2, dimension: 'A' });
    expect(value('min(3 pF, 2 pF, 5 pF)')).toEqual({ value: 2e-12, dimension: 'F' });
    expect(value('max(3 pF, 2 pF)')).toEqual({ value: 3e-12, dimension: 'F' });
    expect(value('abs(-2 mS)')).toEqual({ value: 2e-3, dimension: 'S' });
    expect(value('log10(1000)')).toEqual({ value: 3, dimension: '1' });
    expect(value('log10(1 Mohm / 1 kohm)').value).toBe(3);
    // mathjs: sqrt(1e-24) F^2 … as a plain number check of nesting
    expect(value('sqrt(max(4, 9)) * 2').value).toBe(math.evaluate('sqrt(max(4, 9)) * 2'));
  });

  it('reports dimension and domain errors at the argument', () => {
    const at = (expr: string): { code: string; message: string; range: unknown } => {
      const { text, ranges } = marked(wrap(`  param x = ${expr}\n${STAGE}`));
      const [d] = parseDocument(text).diagnostics;
      expect(d!.range).toEqual(ranges[0]);
      return { code: d!.code, message: d!.message, range: d!.range };
    };
    expect(at('sqrt(⟦1 pF⟧)')).toMatchObject({
      code: 'unit',
      message:
        '`sqrt` needs a quantity whose unit has even powers (such as A²/V²); this is a capacitance (F).',
    });
    expect(at('sqrt(⟦-4⟧)')).toMatchObject({
      code: 'plausibility',
      message: '`sqrt` of a negative value has no real result.',
    });
    expect(at('min(1 pF, ⟦1 kohm⟧)')).toMatchObject({
      code: 'unit',
      message:
        '`min` compares values of one kind: this is a resistance (ohm), the first is a capacitance (F).',
    });
    expect(at('log10(⟦1 kohm⟧)')).toMatchObject({
      code: 'unit',
      message:
        '`log10` needs a plain number, not a resistance (ohm): divide by a reference first (`log10(r / 1 kohm)`).',
    });
    expect(at('log10(⟦0⟧)')).toMatchObject({
      code: 'plausibility',
      message: '`log10` needs a positive value.',
    });
  });

  it('reports an unknown function and a wrong number of arguments at the call', () => {
    expect(diagnostics('  param x = sqr(4)')).toEqual([
      {
        code: 'syntax',
        severity: 'error',
        message:
          'Unknown function `sqr`. Did you mean `sqrt`? The functions are sqrt, min, max, abs, log10; to multiply, write `sqr * (…)`.',
      },
    ]);
    expect(diagnostics('  param x = sqrt(1, 2)')[0]!.message).toBe('`sqrt` takes one value: `sqrt(x)`.');
    expect(diagnostics('  param x = min(1)')[0]!.message).toBe(
      '`min` takes 2 or more values: `min(a, b, …)`.',
    );
    expect(diagnostics('  param x = 2 sqrt(4)').map((d) => d.message)).toEqual([
      'Write `2 * sqrt(…)` to multiply by a function.',
    ]);
    expect(diagnostics('  param x = 2 sqrt(4)')[0]!.message).toBe(
      'Write `2 * sqrt(…)` to multiply by a function.',
    );
  });

  it('reads commas inside a call as its own, also in a corner', () => {
    const doc = parseDocument(
      wrap(
        `  param a = 1 pF\n  param b = 2 pF\n${STAGE}\n  load cap = a\n  corner c a = min(3 pF, 4 pF), b = 1 pF`,
      ),
    );
    expect(doc.diagnostics).toEqual([]);
    expect(doc.designs[0]!.corners[0]!.model!.loads[0]!.cap).toBe(3e-12);
  });

  it('does not take a function name for a reference (rename and references ignore it)', () => {
    const doc = parseDocument(wrap(`  param sqrt = 9\n  param x = sqrt(sqrt)\n${STAGE}`));
    expect(doc.diagnostics).toEqual([]);
    expect(doc.designs[0]!.nominal!.params.find((p) => p.name === 'x')!.value).toBe(3);
    const sym = doc.designs[0]!.symbols.find((s) => s.name === 'sqrt')!;
    expect(sym.references).toHaveLength(1);
  });
});

describe('the parallel operator', () => {
  it('combines resistances: 200 kohm || 250 kohm (mathjs: 1/(1/a + 1/b))', () => {
    const want = math.evaluate('1/(1/(200 kohm) + 1/(250 kohm))').toNumber('ohm'); // 111.1 kohm
    const r = value('200 kohm || 250 kohm');
    expect(r.dimension).toBe('ohm');
    expect(rel(r.value, want)).toBeLessThan(1e-15);
    expect(rel(value('200 kohm ∥ 250 kohm').value, want)).toBeLessThan(1e-15);
  });

  it('binds tighter than + and -, looser than * and /', () => {
    // (20 V / id2) || (25 V / id2) with id2 = 100 uA: 200 kohm || 250 kohm
    const want = math.evaluate('1/(1/(20 V / 100 uA) + 1/(25 V / 100 uA))').toNumber('ohm');
    const r = value('20 V / id2 || 25 V / id2', '  param id2 = 100 uA\n');
    expect(r.dimension).toBe('ohm');
    expect(rel(r.value, want)).toBeLessThan(1e-15);
    // (1 kohm || 1 kohm) + 1 kohm = 1.5 kohm, not 1 kohm || 2 kohm = 0.667 kohm
    expect(value('1 kohm || 1 kohm + 1 kohm').value).toBeCloseTo(1500, 9);
    expect(value('1 kohm + 1 kohm || 1 kohm').value).toBeCloseTo(1500, 9);
    // (2 * 1 kohm) || 2 kohm = 1 kohm
    expect(value('2 * 1 kohm || 2 kohm').value).toBeCloseTo(1000, 9);
    expect(value('rout1 || rout2', '  param rout1 = 1 Mohm\n  param rout2 = 3 Mohm\n').value).toBeCloseTo(
      750e3,
      6,
    );
  });

  it('handles a short, an open circuit and cancelling values without NaN', () => {
    expect(parallel(1e3, 0)).toBe(0);
    expect(parallel(0, 0)).toBe(0);
    expect(parallel(Infinity, 2e3)).toBe(2e3);
    expect(parallel(Infinity, Infinity)).toBe(Infinity);
    expect(Math.abs(parallel(1e3, -1e3))).toBe(Infinity);
    // Tiny and huge values stay exact where 1/a + 1/b would overflow: 1e-308 || 1e-308 = 5e-309 by hand.
    expect(parallel(1e-300, 1e-300)).toBe(5e-301);
    expect(parallel(1e300, 1e300)).toBe(5e299);
    expect(value('1 kohm || 0 ohm')).toEqual({ value: 0, dimension: 'ohm' });
    expect(diagnostics('  param x = 1 kohm || -1 kohm')).toEqual([
      {
        code: 'plausibility',
        severity: 'error',
        message: 'These two resistances cancel in parallel (1/a + 1/b = 0): the result is infinite.',
      },
    ]);
  });

  it('combines only resistances or plain numbers', () => {
    expect(value('2 || 2').value).toBe(1);
    expect(diagnostics('  param x = 1 pF || 1 pF')[0]!.message).toBe(
      '`||` combines resistances (1/(1/a + 1/b)), not a capacitance (F). Capacitances and conductances in parallel add: write `a + b`.',
    );
    expect(diagnostics('  param x = 1 kohm || 1 pF')[0]).toMatchObject({
      code: 'unit',
      message:
        '`||` combines two resistances; this puts a capacitance (F) in parallel with a resistance (ohm).',
    });
  });
});

describe('Meg is not a prefix', () => {
  it('suggests M for Meg, megohm and MEG', () => {
    const msg = (u: string): string => diagnostics(`  param x = 1 ${u}`)[0]!.message;
    const si = 'Prefixes are SI: `M` is mega (1e6), `m` is milli (1e-3).';
    expect(msg('Meg')).toBe(`Unknown unit \`Meg\`. Did you mean \`1 M\`? ${si}`);
    expect(msg('meg')).toBe(`Unknown unit \`meg\`. Did you mean \`1 M\`? ${si}`);
    expect(msg('megohm')).toBe(`Unknown unit \`megohm\`. Did you mean \`1 Mohm\`? ${si}`);
    expect(msg('MEGOHM')).toBe(`Unknown unit \`MEGOHM\`. Did you mean \`1 Mohm\`? ${si}`);
    expect(msg('MegHz')).toBe(`Unknown unit \`MegHz\`. Did you mean \`1 MHz\`? ${si}`);
  });

  it('reports it at the unit in a field, and the statement is left out', () => {
    const { text, ranges } = marked(wrap(`${STAGE}\n  stage t gm = 1 mS rout = 10 ⟦megohm⟧`));
    const doc = parseDocument(text);
    expect(doc.diagnostics.map((d) => [d.code, d.range])).toEqual([['unit', ranges[0]]]);
    expect(doc.designs[0]!.nominal!.stages.map((s) => s.name)).toEqual(['s']);
  });
});

describe('values at the limits of double precision', () => {
  /** The one diagnostic, its range marked in `body`; and the stages that still made it into the model. */
  function limit(body: string): { code: string; message: string; stages: string[] } {
    const { text, ranges } = marked(wrap(`${STAGE}\n${body}`));
    const doc = parseDocument(text);
    expect(doc.diagnostics).toHaveLength(1);
    expect(doc.diagnostics[0]!.range).toEqual(ranges[0]);
    return {
      code: doc.diagnostics[0]!.code,
      message: doc.diagnostics[0]!.message,
      stages: doc.designs[0]?.nominal?.stages.map((s) => s.name) ?? [],
    };
  }

  it('refuses a literal that overflows or underflows a double, at the literal', () => {
    // IEEE 754 binary64: largest finite 1.797e308, smallest normal 2.225e-308 (Number.MAX_VALUE, MIN_NORMAL)
    expect(MIN_NORMAL).toBe(2 ** -1022);
    expect(limit('  stage t gm = 1 mS rout = ⟦1e400⟧')).toMatchObject({
      code: 'plausibility',
      message:
        '`1e400` is too large to compute with (beyond about 1.8e308 in SI units): values this far beyond any circuit cannot be analysed.',
      stages: ['s'],
    });
    // 1e300 TF is 1e312 F in SI: beyond the largest double although the digits are not
    expect(limit('  load cap = ⟦1e300 TF⟧').message).toContain('`1e300 TF` is too large to compute with');
    // 1e-320 is a subnormal double (fewer significant bits); 1e-330 rounds to zero
    expect(limit('  param p = ⟦1e-320⟧').message).toBe(
      '`1e-320` is too small to compute with (below about 2.2e-308 in SI units): values this far beyond any circuit cannot be analysed.',
    );
    expect(limit('  param p = ⟦1e-330⟧').message).toContain('too small');
    expect(limit('  param p = ⟦1e-300 aF⟧').message).toContain('too small');
    // an exact zero is fine
    expect(value('0e-400').value).toBe(0);
  });

  it('refuses a circuit value beyond 1e±30 in SI as not plausible, at the value, and keeps the rest', () => {
    expect(ANALYSABLE_MAGNITUDE).toEqual({ low: 1e-30, high: 1e30 });
    expect(limit('  miller s -> t cc = ⟦1e308 F⟧\n  stage t gm = 1 mS rout = 1 Mohm')).toEqual({
      code: 'plausibility',
      message:
        '`1e308 F` is not a plausible capacitance: values this far beyond any circuit cannot be analysed (magnitudes from 1e-30 to 1e30 are accepted).',
      stages: ['s', 't'],
    });
    expect(limit('  stage t gm = 1 mS rout = ⟦1e308⟧').message).toContain(
      '`1e308 ohm` is not a plausible output resistance',
    );
    expect(limit('  stage t gm = ⟦1e-31⟧ rout = 1 Mohm')).toMatchObject({
      code: 'plausibility',
      stages: ['s'],
    });
    expect(limit('  stage t gm = 1 mS rout = ⟦2 * 1e30⟧').message).toBe(
      '2e30 ohm is not a plausible output resistance: values this far beyond any circuit cannot be analysed (magnitudes from 1e-30 to 1e30 are accepted).',
    );
    // Just inside the band: only the usual-range warning.
    const inside = parseDocument(wrap(`${STAGE}\n  load cap = 1e29 F`)).diagnostics;
    expect(inside.map((d) => [d.code, d.severity])).toEqual([['plausibility', 'warning']]);
  });

  it('names the literal of a parameter that a field uses', () => {
    const { text, ranges } = marked(wrap(`  param c = ⟦1e308 F⟧\n${STAGE}\n  load cap = ⟦c⟧`));
    const [d] = parseDocument(text).diagnostics;
    expect(d).toMatchObject({ code: 'plausibility', severity: 'error', range: ranges[1] });
    expect(d!.message).toContain('`1e308 F` is not a plausible capacitance');
    expect(d!.related).toEqual([{ range: ranges[0], message: '`c` is set here' }]);
    expect(parseDocument(text).designs[0]!.nominal!.loads).toEqual([]);
  });

  it('refuses it in a corner: at the override, and that corner alone has no model', () => {
    const { text, ranges } = marked(
      wrap(`${STAGE}\n  load cap = 1 pF\n  corner big load.cap = ⟦1e308 F⟧\n  corner fine load.cap = 2 pF`),
    );
    const doc = parseDocument(text);
    expect(doc.diagnostics.map((d) => [d.code, d.severity, d.range])).toEqual([
      ['plausibility', 'error', ranges[0]],
    ]);
    const [big, fine] = doc.designs[0]!.corners;
    expect(big!.model).toBeUndefined();
    expect(fine!.model!.loads[0]!.cap).toBe(2e-12);
    expect(doc.designs[0]!.nominal!.loads[0]!.cap).toBe(1e-12);
  });

  it('refuses an operation whose result a double cannot hold, at that operation', () => {
    const overflow = limit('  param p = ⟦1e200 * 1e200⟧');
    expect(overflow.message).toContain('too large to compute with');
    // 1e-200 · 1e-200 = 1e-400 by hand, which a double rounds to 0
    expect(limit('  param p = 3 * (⟦1e-200 * 1e-200⟧)').message).toContain('too small to compute with');
    expect(limit('  param p = ⟦10^400⟧').message).toContain('too large');
    expect(limit('  param p = ⟦0^-1⟧').message).toBe('Zero to a negative power is a division by zero.');
    expect(limit('  param p = ⟦(-8)^0.5⟧').message).toBe(
      'This value is not a real number (a negative number to a fractional power?).',
    );
    // a difference of equal values is an exact zero, not an underflow
    expect(value('1 pF - 1 pF').value).toBe(0);
  });
});

describe('long lines', () => {
  const digits = '7'.repeat(100_000);

  it('lexes a 100 000-digit number as one number token', () => {
    const started = performance.now();
    const { tokens } = lexLine(`  param x = ${digits}`, 0);
    const ms = performance.now() - started;
    expect(tokens.map((t) => t.kind)).toEqual(['ident', 'ident', 'op', 'number']);
    expect(tokens[3]!.text).toHaveLength(100_000);
    // Measured: well under 10 ms. A quadratic pattern would take tens of seconds; the bound is generous.
    expect(ms).toBeLessThan(2000);
  });

  it('reports it once, with a short message, and the rest of the design still works', () => {
    const doc = parseDocument(wrap(`  param x = ${digits} pF\n${STAGE}`));
    expect(doc.diagnostics).toHaveLength(1);
    expect(doc.diagnostics[0]!.message.length).toBeLessThan(200);
    expect(doc.designs[0]!.nominal!.stages).toHaveLength(1);
  });

  it('tells completion it is after a number, in linear time', () => {
    expect(endsAfterNumber(`  param x = ${digits} `)).toBe(true);
    expect(endsAfterNumber(`  param x = ${digits}p`)).toBe(true);
    expect(endsAfterNumber(`  param x = ${digits} * `)).toBe(false);
    expect(endsAfterNumber(`  param x = ${'a'.repeat(100_000)}1 `)).toBe(false);
  });

  it('tells completion where a unit is being typed', () => {
    expect(endsAfterNumber('  load cap = 1.1 ')).toBe(true);
    expect(endsAfterNumber('  load cap = 1.1p')).toBe(true);
    expect(endsAfterNumber('  require slew >= 6 V/u')).toBe(true);
    expect(endsAfterNumber('  load cap = .5')).toBe(true);
    expect(endsAfterNumber('  load cap = 2e-3')).toBe(true);
    expect(endsAfterNumber('  stage s gm = gm1 ')).toBe(false);
    expect(endsAfterNumber('  load cap = 1 pF ')).toBe(false);
    expect(endsAfterNumber('  load cap = 1.2.3 ')).toBe(false);
    expect(endsAfterNumber('  load cap = ')).toBe(false);
  }, 30_000);
}, 60_000);
