// Every diagnostic the language layer reports: its code, severity, exact message and exact range (⟦…⟧).
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { marked } from './marked';

const S = '  stage s gm = 1 mS rout = 1 Mohm\n';
/** A design around the lines, with a valid stage first so that the design has an output. */
const d = (body: string): string => `design d\n${S}${body}\nend\n`;

type Case = [title: string, source: string, code: string, severity: 'error' | 'warning', message: string];

const cases: Case[] = [
  // ---- document structure ----
  [
    'text outside a design',
    '⟦stage⟧ x gm = 1 mS\ndesign d\n' + S + 'end',
    'syntax',
    'error',
    'Expected `design NAME`, found `stage`.',
  ],
  ['stray end', 'design d\n' + S + 'end\n⟦end⟧', 'syntax', 'error', '`end` without a `design` to close.'],
  ['junk after end', 'design d\n' + S + 'end ⟦now⟧', 'syntax', 'error', 'Unexpected `now` after `end`.'],
  [
    'missing design name',
    '⟦design⟧\n' + S + 'end',
    'syntax',
    'error',
    'Missing the design name after `design`.',
  ],
  ['bad design name', 'design ⟦42⟧\n' + S + 'end', 'syntax', 'error', 'Expected a design name, found `42`.'],
  [
    'junk after design name',
    'design d ⟦x⟧\n' + S + 'end',
    'syntax',
    'error',
    'Unexpected `x` after the design name.',
  ],
  ['missing end', '⟦design d⟧\n' + S, 'syntax', 'error', 'Design `d` has no `end`.'],
  // ---- statements ----
  [
    'unknown statement',
    d('  ⟦miler⟧ s -> in cc = 1 pF'),
    'syntax',
    'error',
    'Unknown statement `miler`. Did you mean `miller`? A design holds: param, node, supply, stage, load, miller, indirect, feedforward, element, output, feedback, require, minimize, sweep, corner; it closes with `end`.',
  ],
  ['missing =', d('  load ⟦cap⟧ 3 pF'), 'syntax', 'error', 'Missing `=` after `cap`.'],
  ['missing value at the end', d('  load cap = 1 pF ⟦res =⟧'), 'syntax', 'error', 'Missing value for `res`.'],
  [
    'missing value before a field',
    d('  load ⟦cap =⟧ res = 1 kohm'),
    'syntax',
    'error',
    'Missing value for `cap`.',
  ],
  [
    'missing value after an operator',
    d('  param x = 2 ⟦*⟧'),
    'syntax',
    'error',
    'Expected a value after `*`.',
  ],
  ['unclosed parenthesis', d('  param x = ⟦(⟧1 + 2'), 'syntax', 'error', 'Missing `)` to close this `(`.'],
  ['bad number', d('  param x = ⟦1.2.3⟧ kohm'), 'syntax', 'error', 'Bad number `1.2.3`.'],
  ['bad exponent', d('  param x = ⟦5e⟧'), 'syntax', 'error', 'Bad number `5e`.'],
  [
    'unknown field',
    d('  load ⟦cup⟧ = 1 pF'),
    'syntax',
    'error',
    'Unknown field `cup` (load takes cap, res). Did you mean `cap`?',
  ],
  [
    'unexpected word',
    d('  stage t gm = 1 mS rout = 1 Mohm ⟦invertin⟧'),
    'syntax',
    'error',
    'Unexpected `invertin` (stage takes gm, rout, cap, bias, inverting, noninverting). Did you mean `inverting`?',
  ],
  ['junk at the end', d('  output s ⟦s⟧'), 'syntax', 'error', 'Unexpected `s` at the end of the statement.'],
  ['missing name', d('  ⟦param⟧'), 'syntax', 'error', 'Missing a parameter name after `param`.'],
  [
    'wrong token for a name',
    d('  stage ⟦=⟧ gm = 1 mS'),
    'syntax',
    'error',
    'Expected a stage name, found `=`.',
  ],
  [
    'missing ->',
    d('  miller s ⟦in⟧ cc = 1 pF'),
    'syntax',
    'error',
    'Expected `->` between the two nodes of `miller`.',
  ],
  [
    'unknown element kind',
    d('  element ⟦ind⟧ s gnd = 1'),
    'syntax',
    'error',
    'Unknown element kind `ind`; expected res, cap, gm.',
  ],
  [
    'element without =',
    d('  element res s gnd ⟦1⟧'),
    'syntax',
    'error',
    'Missing `=` before the value of `element res`.',
  ],
  [
    'unknown requirement',
    d('  require ⟦ugg⟧ >= 1 MHz'),
    'syntax',
    'error',
    'Unknown requirement `ugg`; expected ugf, pm, gainmargin, zero, slew, settle, dcgain, clgain, zout, psrr, loadstep. Did you mean `ugf`?',
  ],
  [
    'missing comparison',
    d('  require ugf ⟦=⟧ 1 MHz'),
    'syntax',
    'error',
    'Expected `>=` or `<=` after `ugf`.',
  ],
  [
    'strict comparison',
    d('  require ugf ⟦>⟧ 1 MHz'),
    'syntax',
    'error',
    'Expected `>=` or `<=` after `ugf`. A requirement includes its bound: write `>=`.',
  ],
  [
    'a node named on a broken line is not called unconnected',
    d('  node a\n  element gm in ⟦a⟧ = 40 uS'),
    'syntax',
    'error',
    'Expected `->` between the sensed node(s) and the driven node of `element gm`.',
  ],
  [
    'feedback at a node nothing senses',
    d('  node q\n  element res s q = 1 kohm\n  element cap q gnd = 1 pF\n  feedback at ⟦q⟧'),
    'reference',
    'error',
    'Nothing senses `q`: the loop is broken where a transconductor senses the feedback node, so name a node that a stage (`from`), an `element gm` or a `feedforward` senses.',
  ],
  [
    'feedback at with a beta',
    d('  feedback at s ⟦beta⟧ = 0.5'),
    'syntax',
    'error',
    '`feedback at` closes the loop through the circuit itself; a `beta` cannot be given with it.',
  ],
  [
    'feedback beta with at',
    d('  feedback beta = 0.5 ⟦at⟧ s'),
    'syntax',
    'error',
    '`feedback at NODE` and `feedback beta = …` are exclusive: write one of them.',
  ],
  [
    'a corner overriding the beta of a loop closed by the circuit',
    d('  stage t gm = 1 mS rout = 1 Mohm\n  feedback at s\n  corner c feedback.beta = ⟦0.5⟧'),
    'reference',
    'error',
    '`feedback at` closes the loop through the circuit and has no `beta` to override: override the values of the elements that set the loop instead.',
  ],
  [
    'a stage sensing one node on both sides',
    d('  stage t from s, ⟦s⟧ gm = 1 mS rout = 1 Mohm'),
    'reference',
    'error',
    'A stage cannot sense the same node on both sides.',
  ],
  [
    'psrr from a node that is not a supply',
    d('  require psrr >= 40 dB at 1 kHz from ⟦s⟧'),
    'reference',
    'error',
    '`s` is not a supply: declare it with `supply s`, or name one that is.',
  ],
  [
    'psrr without a frequency',
    d('  require psrr >= 40 ⟦dB⟧'),
    'syntax',
    'error',
    '`psrr` needs `at` and a frequency: write `require psrr >= 40 dB at 10 kHz`.',
  ],
  [
    'zout as a lower bound',
    d('  require zout ⟦>=⟧ 1 ohm'),
    'syntax',
    'error',
    '`zout` takes only `<=`: write `require zout <= 0.1 ohm at 100 kHz`.',
  ],
  [
    'the input as a supply',
    d('  supply ⟦in⟧'),
    'syntax',
    'error',
    '`in` is a built-in node and cannot be declared as a node.',
  ],
  [
    'zero as an upper bound',
    d('  require zero ⟦<=⟧ 10 * ugf'),
    'syntax',
    'error',
    'A zero requirement is a lower bound: write `require zero >= 10 * ugf`.',
  ],
  [
    'settle without within',
    d('  require settle 0.1 % ⟦in⟧ 200 ns'),
    'syntax',
    'error',
    'Expected `within` and a time after the tolerance (e.g. `within 200 ns`).',
  ],
  [
    'settle without tolerance',
    d('  require ⟦settle⟧'),
    'syntax',
    'error',
    'Missing the tolerance after `settle` (e.g. `0.1 %`).',
  ],
  [
    'from twice',
    d('  stage t from s ⟦from⟧ in gm = 1 mS rout = 1 Mohm'),
    'syntax',
    'error',
    '`from` is given twice.',
  ],
  [
    'missing required fields',
    d('  ⟦stage t⟧ cap = 1 pF'),
    'syntax',
    'error',
    '`stage` needs `gm = …` and `rout = …`.',
  ],
  ['missing cc', d('  ⟦miller⟧ in -> s rz = 1 kohm'), 'syntax', 'error', '`miller` needs `cc = …`.'],
  ['empty load', d('  ⟦load⟧'), 'syntax', 'error', '`load` needs `cap = …` or `res = …`.'],
  [
    'keyword as a name',
    d('  param ⟦stage⟧ = 1'),
    'syntax',
    'error',
    '`stage` is a keyword and cannot be declared as a param.',
  ],
  [
    'built-in node declared',
    d('  node ⟦gnd⟧'),
    'syntax',
    'error',
    '`gnd` is a built-in node and cannot be declared as a node.',
  ],
  [
    'trailing comma in a corner',
    d('  corner c s.gm = 2 mS ⟦,⟧'),
    'syntax',
    'error',
    'Expected another override after `,`.',
  ],
  ['empty corner', d('  corner ⟦c⟧'), 'syntax', 'warning', 'Corner `c` overrides nothing.'],
  [
    'case hint for a prefix',
    d('  param x = 3 ⟦KF⟧'),
    'unit',
    'error',
    'Unknown unit `KF`. Did you mean `kF`?',
  ],
  [
    'ground as a miller node',
    d('  miller ⟦gnd⟧ -> s cc = 1 pF'),
    'reference',
    'error',
    "A miller capacitor's node cannot be ground.",
  ],
  [
    'decimal comma',
    d('  stage t gm = 1⟦,⟧5 mS rout = 1 Mohm'),
    'syntax',
    'error',
    'Unexpected `,` in a number: the decimal separator is `.` (`1.5 mS`).',
  ],
  [
    'unexpected character',
    d('  load cap = 1 pF ⟦;⟧'),
    'syntax',
    'error',
    'Unexpected `;` (load takes cap, res).',
  ],
  // ---- units ----
  ['unknown unit', d('  param x = 3 ⟦pf⟧'), 'unit', 'error', 'Unknown unit `pf`. Did you mean `pF`?'],
  [
    'unknown prefix',
    d('  param x = 3 ⟦QF⟧'),
    'unit',
    'error',
    'Unknown unit `QF`. `Q` is not an SI prefix (a f p n u µ m k M G T).',
  ],
  ['unknown denominator', d('  param x = 3 V/⟦uz⟧'), 'unit', 'error', 'Unknown unit `uz` in `V/uz`.'],
  [
    'ugf written as a unit',
    d('  require zero >= 10 ⟦ugf⟧'),
    'unit',
    'error',
    'Unknown unit `ugf`. Write `10 * ugf`.',
  ],
  [
    'wrong dimension in a field',
    d('  load cap = ⟦2 kohm⟧'),
    'unit',
    'error',
    '`cap` expects a capacitance (F), but this is a resistance (ohm).',
  ],
  [
    'wrong dimension in a requirement',
    d('  require pm >= ⟦60 dB⟧'),
    'unit',
    'error',
    '`pm` expects a phase (deg), but this is a level in decibels (dB).',
  ],
  [
    'zero needs a multiple of ugf',
    d('  require zero >= ⟦10 MHz⟧'),
    'unit',
    'error',
    '`zero` expects a multiple of the unity-gain frequency (N * ugf), but this is a frequency (Hz).',
  ],
  [
    'dimension mismatch in a sum',
    d('  param x = ⟦1 pF + 1 uS⟧'),
    'unit',
    'error',
    'Cannot add a transconductance (S) to a capacitance (F).',
  ],
  [
    'exponent with a unit',
    d('  param x = 2 ^ ⟦1 s⟧'),
    'unit',
    'error',
    'An exponent must be a plain number, not a time (s).',
  ],
  [
    'corner changes a dimension',
    d('  param g = 1 mS\n  corner c g = ⟦1 pF⟧'),
    'unit',
    'error',
    'Parameter `g` is a transconductance (S); this corner gives a capacitance (F).',
  ],
  // ---- references ----
  ['undefined name', d('  param x = 2 * ⟦gm9⟧'), 'reference', 'error', 'Undefined name `gm9`.'],
  [
    'undefined name with a near miss',
    d('  param gm1 = 1 mS\n  param x = 2 * ⟦gm2⟧'),
    'reference',
    'error',
    'Undefined name `gm2`. Did you mean `gm1`?',
  ],
  [
    'a unit with spaces',
    d('  require slew >= 6 V / ⟦us⟧'),
    'reference',
    'error',
    'Undefined name `us`. `us` is a unit: it follows a number, and a compound unit has no spaces (`V/us`).',
  ],
  [
    'ugf outside zero',
    d('  param x = ⟦ugf⟧'),
    'reference',
    'error',
    'Undefined name `ugf`. `ugf` can only be used in `require zero >= N * ugf`.',
  ],
  ['undefined node', d('  miller ⟦first⟧ -> s cc = 1 pF'), 'reference', 'error', 'Undefined node `first`.'],
  [
    'undefined node with a near miss',
    d('  load at ⟦ss⟧ cap = 1 pF'),
    'reference',
    'error',
    'Undefined node `ss`. Did you mean `s`?',
  ],
  [
    'a node used as a value',
    d('  param x = ⟦s⟧'),
    'reference',
    'error',
    '`s` is a stage (a node), not a value.',
  ],
  [
    'a parameter used as a node',
    d('  param p = 1\n  load at ⟦p⟧ cap = 1 pF'),
    'reference',
    'error',
    '`p` is a parameter, not a node.',
  ],
  ['self reference', d('  param ⟦a⟧ = a + 1'), 'reference', 'error', 'Parameter `a` refers to itself.'],
  ['output at ground', d('  output ⟦gnd⟧'), 'reference', 'error', 'The output cannot be ground.'],
  [
    'output at the input',
    d('  output ⟦in⟧'),
    'reference',
    'error',
    'The output cannot be the driven input `in`.',
  ],
  [
    'miller to itself',
    d('  miller ⟦s -> s⟧ cc = 1 pF'),
    'reference',
    'error',
    '`miller` needs two different nodes.',
  ],
  [
    'resistor to itself',
    d('  element res ⟦s s⟧ = 1 kohm'),
    'reference',
    'error',
    'This resistor connects a node to itself.',
  ],
  [
    'no output',
    'design ⟦e⟧\n  param x = 1\nend',
    'reference',
    'error',
    'Design `e` has no stage and names no output: add `output NODE`.',
  ],
  [
    'unconnected node',
    d('  node ⟦lonely⟧'),
    'reference',
    'warning',
    'Node `lonely` is declared but nothing connects to it.',
  ],
  [
    'node only sensed',
    d('  node ⟦x⟧\n  element gm x -> s = 1 mS'),
    'reference',
    'warning',
    'Nothing connects to node `x`: it is only sensed, so its voltage is undefined.',
  ],
  [
    'corner: undefined parameter',
    d('  corner c ⟦gm⟧ = 1 mS'),
    'reference',
    'error',
    'Undefined parameter `gm`.',
  ],
  [
    'corner: a stage without a field',
    d('  corner c ⟦s⟧ = 1 mS'),
    'reference',
    'error',
    '`s` is a stage; a corner overrides a parameter (`gm1 = …`) or a field (`s.gm = …`).',
  ],
  [
    'corner: unknown field',
    d('  corner c s.⟦gain⟧ = 1 mS'),
    'reference',
    'error',
    '`stage` has no field `gain` (fields: gm, rout, cap, bias).',
  ],
  [
    'corner: missing statement',
    d('  corner c ⟦miller.cc⟧ = 1 pF'),
    'reference',
    'error',
    'There is no `miller` statement for `miller.cc` to override.',
  ],
  [
    'corner: ambiguous statement',
    d('  miller in -> s cc = 1 pF\n  miller in -> s cc = 2 pF\n  corner c ⟦miller.cc⟧ = 1 pF'),
    'reference',
    'error',
    'There are 2 `miller` statements, so `miller.cc` is ambiguous: put the value in a `param` and override that.',
  ],
  [
    'corner: two loads at the output',
    d('  load cap = 1 pF\n  load at s cap = 2 pF\n  corner heavy ⟦load.cap⟧ = 20 pF'),
    'reference',
    'error',
    'There are 2 `load` statements at the output, so `load.cap` is ambiguous: put the value in a `param` and override that.',
  ],
  [
    'corner: unknown target with a field',
    d('  corner c ⟦t⟧.gm = 1 mS'),
    'reference',
    'error',
    'Undefined name `t`.',
  ],
  // ---- plausibility ----
  [
    'negative gm',
    d('  stage t gm = ⟦-1 mS⟧ rout = 1 Mohm'),
    'plausibility',
    'error',
    'A transconductance cannot be negative: write `gm` as a positive value and add `inverting`.',
  ],
  [
    'zero gm of a stage',
    d('  stage t gm = ⟦0 mS⟧ rout = 1 Mohm'),
    'plausibility',
    'error',
    "A stage's `gm` of zero leaves the amplifier without gain; it must be positive.",
  ],
  [
    'zero gm',
    d('  feedforward in -> s gm = ⟦0⟧'),
    'plausibility',
    'warning',
    '`gm` is zero: this path carries no signal.',
  ],
  [
    'zero resistance',
    d('  stage t gm = 1 mS rout = ⟦0 ohm⟧'),
    'plausibility',
    'error',
    'A resistance of zero is a short circuit; `rout` must be positive.',
  ],
  [
    'negative resistance',
    d('  element res s gnd = ⟦-1 kohm⟧'),
    'plausibility',
    'error',
    'A resistance cannot be negative; `element res` must be positive.',
  ],
  [
    'negative rz',
    d('  miller in -> s cc = 1 pF rz = ⟦-5 ohm⟧'),
    'plausibility',
    'error',
    'A resistance cannot be negative; `rz` must be zero or positive.',
  ],
  [
    'negative capacitance',
    d('  load cap = ⟦-1 pF⟧'),
    'plausibility',
    'error',
    'A capacitance cannot be negative; `cap` must be zero or positive.',
  ],
  ['division by zero', d('  load cap = ⟦1 pF / 0⟧'), 'plausibility', 'error', 'Division by zero.'],
  ['parameter division by zero', d('  param x = ⟦1 / 0⟧'), 'plausibility', 'error', 'Division by zero.'],
  ['zero over zero', d('  param x = ⟦0 / 0⟧'), 'plausibility', 'error', 'Division by zero.'],
  [
    'buffer gm',
    d('  indirect s -> in cc = 1 pF gm = ⟦0⟧'),
    'plausibility',
    'error',
    "The buffer's `gm` must be positive.",
  ],
  [
    'bias',
    d('  stage t gm = 1 mS rout = 1 Mohm bias = ⟦0⟧'),
    'plausibility',
    'error',
    'A bias current must be positive.',
  ],
  ['beta', d('  feedback beta = ⟦-1⟧'), 'plausibility', 'error', 'The feedback factor must be positive.'],
  [
    'beta above 1',
    d('  feedback beta = ⟦2⟧'),
    'plausibility',
    'warning',
    'A feedback factor above 1 means a closed-loop gain below 1; is that intended?',
  ],
  ['ugf', d('  require ugf >= ⟦0 Hz⟧'), 'plausibility', 'error', 'A unity-gain frequency must be positive.'],
  [
    'tolerance',
    d('  require settle ⟦150 %⟧ within 1 us'),
    'plausibility',
    'error',
    'A settling tolerance must lie between 0 and 100 % (it is 150 %).',
  ],
  [
    'phase margin',
    d('  require pm >= ⟦200 deg⟧'),
    'plausibility',
    'error',
    'A phase margin must lie between 0 and 180 deg.',
  ],
  [
    'missing prefix on a capacitor',
    d('  miller in -> s cc = ⟦1.2 F⟧'),
    'plausibility',
    'warning',
    '1.2 F is far outside the usual range for an on-chip capacitance (1 aF to 1 uF). A missing prefix? Did you mean `1.2 pF`?',
  ],
  [
    'missing prefix on a gm',
    d('  stage t gm = ⟦150⟧ rout = 1 Mohm'),
    'plausibility',
    'warning',
    '150 S is far outside the usual range for a transconductance (1 nS to 1 S). A missing prefix? Did you mean `150 uS`?',
  ],
  [
    'missing prefix on a slew rate',
    d('  require slew >= ⟦6⟧'),
    'plausibility',
    'warning',
    '6 V/s is far outside the usual range for a slew rate (1 kV/s to 10 TV/s). A missing prefix? Did you mean `6 V/us`?',
  ],
  [
    'no prefix suggested for a literal in exponent form',
    d('  load cap = ⟦1e20⟧'),
    'plausibility',
    'warning',
    '1e20 F is far outside the usual range for a capacitance (1 aF to 10 mF).',
  ],
  [
    'a plain tolerance above 1 %',
    d('  require settle ⟦0.1⟧ within 200 ns'),
    'plausibility',
    'warning',
    'A plain tolerance is a fraction: 0.1 is 10 %. Write `0.1 %` if you meant percent.',
  ],
  [
    'huge expression',
    d('  param c = 2 F\n  load cap = ⟦c * 10⟧'),
    'plausibility',
    'warning',
    '20 F is far outside the usual range for a capacitance (1 aF to 10 mF).',
  ],
];

describe('every diagnostic, with its exact range', () => {
  for (const [title, source, code, severity, message] of cases) {
    it(title, () => {
      const { text, ranges } = marked(source);
      const doc = parseDocument(text);
      expect(
        doc.diagnostics.map((x) => ({
          code: x.code,
          severity: x.severity,
          message: x.message,
          range: x.range,
        })),
      ).toEqual([{ code, severity, message, range: ranges[0] }]);
    });
  }
});

describe('related information', () => {
  it('suggests the prefix at the parameter a field names', () => {
    const { text, ranges } = marked(d('  param gm1 = ⟦150⟧\n  stage t gm = ⟦gm1⟧ rout = 1 Mohm'));
    const diags = parseDocument(text).diagnostics;
    expect(diags).toEqual([
      {
        code: 'plausibility',
        severity: 'warning',
        message:
          '150 S is far outside the usual range for a transconductance (1 nS to 1 S). A missing prefix? Did you mean `gm1 = 150 uS`?',
        range: ranges[1],
        related: [{ range: ranges[0], message: '`gm1` is set here' }],
      },
    ]);
  });

  it('points a duplicate at the first declaration', () => {
    const { text, ranges } = marked(d('  param ⟦g⟧ = 1\n  node ⟦g⟧'));
    const [diag] = parseDocument(text).diagnostics;
    expect(diag).toMatchObject({
      code: 'reference',
      message: '`g` is already declared (as a param).',
      range: ranges[1],
    });
    expect(diag!.related).toEqual([{ range: ranges[0], message: 'first declaration of `g`' }]);
  });

  it('points a duplicate design and corner at the first', () => {
    const { text, ranges } = marked(
      `design ⟦a⟧\n${S}  corner ⟦c⟧ s.gm = 1 mS\n  corner ⟦c⟧ s.gm = 2 mS\nend\ndesign ⟦a⟧\n${S}end`,
    );
    const diags = parseDocument(text).diagnostics;
    expect(diags.map((x) => [x.message, x.range, x.related])).toEqual([
      [
        'Corner `c` is already declared.',
        ranges[2],
        [{ range: ranges[1], message: 'first declaration of `c`' }],
      ],
      [
        'Design `a` is already declared in this file.',
        ranges[3],
        [{ range: ranges[0], message: 'first design `a`' }],
      ],
    ]);
  });

  it('reports a parameter cycle once, at the member declared first, with the others as related', () => {
    const { text, ranges } = marked(
      d(
        '  param ⟦a⟧ = b * 2\n  param ⟦b⟧ = c + 1\n  param ⟦c⟧ = a\n  param x = a + 1\n  stage t gm = b * 1 mS rout = 1 Mohm',
      ),
    );
    const diags = parseDocument(text).diagnostics;
    expect(diags).toEqual([
      {
        code: 'reference',
        severity: 'error',
        message: 'Parameters depend on each other in a cycle: `a` → `b` → `c` → `a`.',
        range: ranges[0],
        related: [
          { range: ranges[1], message: '`b` is part of the cycle' },
          { range: ranges[2], message: '`c` is part of the cycle' },
        ],
      },
    ]);
  });

  it('points a repeated field, override, output and feedback at the first', () => {
    const { text, ranges } = marked(
      d(
        '  stage t ⟦gm⟧ = 1 mS rout = 1 Mohm ⟦gm⟧ = 2 mS\n  corner c ⟦s.gm⟧ = 1 mS, ⟦s.gm⟧ = 2 mS\n  ⟦output⟧ s\n  ⟦output⟧ t\n  ⟦feedback⟧ beta = 1\n  ⟦feedback⟧ beta = 0.5',
      ),
    );
    const diags = parseDocument(text).diagnostics;
    expect(diags.map((x) => [x.message, x.range, x.related?.[0]?.range])).toEqual([
      ['`gm` is given twice; the first value is used.', ranges[1], ranges[0]],
      ['`s.gm` is overridden twice in this corner.', ranges[3], ranges[2]],
      ['`output` is given twice; the first one is used.', ranges[5], ranges[4]],
      ['`feedback` is given twice; the first one is used.', ranges[7], ranges[6]],
    ]);
    const m = parseDocument(text).designs[0]!.nominal!;
    expect(m.stages.find((x) => x.name === 't')!.gm).toBe(1e-3);
    expect(m.output).toBe('s');
    expect(m.feedback).toMatchObject({ kind: 'factor', beta: 1 });
  });
});

describe('an override that could mean several statements', () => {
  it('points at every load it could mean, and the corner gets no model', () => {
    const { text, ranges } = marked(
      d(
        '  ⟦load⟧ cap = 1 pF\n  ⟦load⟧ res = 10 kohm\n  load at in cap = 5 pF\n  corner heavy ⟦load.cap⟧ = 20 pF',
      ),
    );
    const doc = parseDocument(text);
    expect(doc.diagnostics).toEqual([
      {
        code: 'reference',
        severity: 'error',
        message:
          'There are 2 `load` statements at the output, so `load.cap` is ambiguous: put the value in a `param` and override that.',
        range: ranges[2],
        related: [
          { range: ranges[0], message: 'a `load` statement at the output' },
          { range: ranges[1], message: 'a `load` statement at the output' },
        ],
      },
    ]);
    expect(doc.designs[0]!.corners[0]!.model).toBeUndefined();
  });

  it('takes the one load at the output when others sit elsewhere', () => {
    const doc = parseDocument(
      d('  load cap = 1 pF\n  load at in cap = 5 pF\n  corner heavy load.cap = 20 pF'),
    );
    expect(doc.diagnostics).toEqual([]);
    expect(doc.designs[0]!.corners[0]!.model!.loads.map((l) => l.cap)).toEqual([20e-12, 5e-12]);
  });
});
