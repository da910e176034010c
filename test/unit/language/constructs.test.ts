// Every construct of the language and the model it yields. Expected SI values follow from the SI prefix
// definitions (BIPM SI Brochure, 9th ed., table 7) applied to the literals written in each case.
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import type { DesignModel } from '../../../shared/src/language/model';
import { marked, wrap } from './marked';

const BASELINE = `# comment to end of line
design NAME
  param gm1 = 150 uS                 # expressions
  node a, b
  stage first  gm = gm1 rout = 1.8 Mohm cap = 90 fF bias = 10 uA
  stage second from first gm = 2.2 mS rout = 120 kohm cap = 250 fF inverting bias = 100 uA
  load cap = 3 pF res = 1 Mohm
  miller first -> second cc = 1.1 pF rz = 650 ohm
  indirect second -> first cc = 1 pF gm = 500 uS cap = 50 fF
  feedforward in -> second gm = 40 uS inverting
  element res a b = 10 kohm
  element cap a gnd = 25 fF
  element gm in -> a = 40 uS inverting
  output second
  feedback beta = 1
  require ugf >= 15 MHz
  require pm >= 60 deg
  require gainmargin >= 10 dB
  require zero >= 10 * ugf
  require slew >= 6 V/us
  require settle 0.1 % within 200 ns
  require dcgain >= 80 dB
  corner slow  gm1 = 120 uS, load.cap = 4 pF, second.gm = 2 mS
end
`;

function nominal(text: string): DesignModel {
  const doc = parseDocument(text);
  expect(doc.diagnostics).toEqual([]);
  return doc.designs[0]!.nominal!;
}

describe('the baseline design', () => {
  const doc = parseDocument(BASELINE);
  const m = doc.designs[0]!.nominal!;

  it('parses without diagnostics', () => {
    expect(doc.diagnostics).toEqual([]);
    expect(doc.designs.map((d) => d.name)).toEqual(['NAME']);
  });

  it('builds the stages with SI values, inputs and polarity', () => {
    expect(m.stages.map((s) => [s.name, s.input, s.gm, s.rout, s.cap, s.polarity, s.bias])).toEqual([
      ['first', { kind: 'node', name: 'in' }, 150e-6, 1.8e6, 90e-15, 'noninverting', 10e-6],
      ['second', { kind: 'node', name: 'first' }, 2.2e-3, 120e3, 250e-15, 'inverting', 100e-6],
    ]);
  });

  it('places the load at the output and reads compensation', () => {
    expect(m.output).toBe('second');
    expect(m.input).toBe('in');
    expect(m.loads.map((l) => [l.node, l.cap, l.res])).toEqual([['second', 3e-12, 1e6]]);
    expect(m.millers.map((x) => [x.from, x.to, x.cc, x.rz])).toEqual([['first', 'second', 1.1e-12, 650]]);
    expect(m.buffered.map((x) => [x.from, x.to, x.cc, x.gm, x.cap])).toEqual([
      ['second', 'first', 1e-12, 500e-6, 50e-15],
    ]);
  });

  it('turns feedforward and element lines into elements', () => {
    expect(m.elements.map(({ origin: _, ...e }) => e)).toEqual([
      {
        kind: 'gm',
        control: { kind: 'node', name: 'in' },
        output: { kind: 'node', name: 'second' },
        value: 40e-6,
        polarity: 'inverting',
      },
      { kind: 'res', a: { kind: 'node', name: 'a' }, b: { kind: 'node', name: 'b' }, value: 10e3 },
      { kind: 'cap', a: { kind: 'node', name: 'a' }, b: { kind: 'ground' }, value: 25e-15 },
      {
        kind: 'gm',
        control: { kind: 'node', name: 'in' },
        output: { kind: 'node', name: 'a' },
        value: 40e-6,
        polarity: 'inverting',
      },
    ]);
  });

  it('reads every requirement in SI (tolerance as a fraction)', () => {
    expect(m.requirements.map(({ origin: _, ...r }) => r)).toEqual([
      { kind: 'ugf', op: '>=', value: 15e6 },
      { kind: 'pm', op: '>=', value: 60 },
      { kind: 'gain-margin', op: '>=', value: 10 },
      { kind: 'zero', op: '>=', factor: 10 },
      { kind: 'slew', op: '>=', value: 6e6 },
      { kind: 'settle', tolerance: 0.001, within: 200e-9 },
      { kind: 'dc-gain', op: '>=', value: 80 },
    ]);
    expect(m.feedback).toMatchObject({ kind: 'factor', beta: 1 });
    expect(m.feedback.origin?.fields.beta?.text).toBe('1');
  });

  it('lists the nodes with their kinds', () => {
    expect(m.nodes.map((n) => [n.name, n.kind])).toEqual([
      ['in', 'input'],
      ['a', 'declared'],
      ['b', 'declared'],
      ['first', 'stage'],
      ['second', 'stage'],
    ]);
  });

  it('evaluates the corner with its overrides', () => {
    const c = doc.designs[0]!.corners;
    expect(c.map((x) => x.name)).toEqual(['slow']);
    const slow = c[0]!.model!;
    expect(slow.corner).toBe('slow');
    expect(slow.stages[0]!.gm).toBe(120e-6);
    expect(slow.stages[1]!.gm).toBe(2e-3);
    expect(slow.loads[0]!.cap).toBe(4e-12);
    expect(slow.loads[0]!.res).toBe(1e6);
    // the nominal model is untouched
    expect(m.stages[0]!.gm).toBe(150e-6);
    expect(m.corner).toBeUndefined();
  });

  it('keeps the exact text of the design block', () => {
    const d = doc.designs[0]!;
    expect(d.text.startsWith('design NAME')).toBe(true);
    expect(d.text.endsWith('end')).toBe(true);
    expect(d.range.start).toEqual({ line: 1, character: 0 });
    expect(d.range.end).toEqual({ line: 23, character: 3 });
    expect(d.nameRange).toEqual({ start: { line: 1, character: 7 }, end: { line: 1, character: 11 } });
  });
});

describe('origins', () => {
  it('gives statement, keyword and field ranges, the insertion point, and the parameter of a field', () => {
    const { text, ranges } = marked(
      wrap('  param gm1 = 150 uS\n  ⟦⟦stage⟧ first gm = ⟦gm1⟧ rout = ⟦1.8 Mohm⟧ cap = ⟦2 * 45 fF⟧⟧   # note'),
    );
    const s = nominal(text).stages[0]!;
    const [statement, keyword, gm, rout, cap] = ranges;
    expect(s.origin.range).toEqual(statement);
    expect(s.origin.keywordRange).toEqual(keyword);
    expect(s.origin.insertAt).toEqual(statement!.end);
    expect(s.origin.fields.gm).toEqual({ range: gm, text: 'gm1', param: 'gm1' });
    expect(s.origin.fields.rout).toEqual({ range: rout, text: '1.8 Mohm' });
    expect(s.origin.fields.cap).toEqual({ range: cap, text: '2 * 45 fF' });
    expect(s.origin.fields.bias).toBeUndefined();
  });

  it('keys requirement origins by value, factor, tolerance and within', () => {
    const { text, ranges } = marked(
      wrap(
        '  stage s gm = 1 mS rout = 1 Mohm\n  require ugf >= ⟦15 MHz⟧\n  require zero >= ⟦10 * ugf⟧\n  require settle ⟦0.1 %⟧ within ⟦200 ns⟧',
      ),
    );
    const r = nominal(text).requirements;
    expect(r[0]!.origin.fields.value!.range).toEqual(ranges[0]);
    expect(r[1]!.origin.fields.factor!.range).toEqual(ranges[1]);
    expect(r[2]!.origin.fields.tolerance!.range).toEqual(ranges[2]);
    expect(r[2]!.origin.fields.within!.range).toEqual(ranges[3]);
  });

  it('points corner fields at the override', () => {
    const { text, ranges } = marked(
      wrap(
        '  param g = 1 mS\n  stage s gm = g rout = 1 Mohm\n  corner hot s.rout = ⟦900 kohm⟧, g = ⟦0.9 mS⟧',
      ),
    );
    const doc = parseDocument(text);
    expect(doc.diagnostics).toEqual([]);
    const corner = doc.designs[0]!.corners[0]!;
    expect(corner.origin.fields['s.rout']!.range).toEqual(ranges[0]);
    expect(corner.origin.fields.g!.range).toEqual(ranges[1]);
    expect(corner.model!.stages[0]!.origin.fields.rout!.range).toEqual(ranges[0]);
    expect(corner.model!.stages[0]!.rout).toBe(900e3);
    expect(corner.model!.stages[0]!.gm).toBe(0.9e-3);
    expect(corner.model!.params[0]!.origin.fields.value!.range).toEqual(ranges[1]);
  });
});

describe('statements', () => {
  it('defaults: first stage from `in`, next from the previous, cap 0, noninverting, beta 1, output = last stage', () => {
    const m = nominal(wrap('  stage a gm = 1 mS rout = 1 Mohm\n  stage b gm = 2 mS rout = 2 Mohm'));
    expect(m.stages.map((s) => [s.name, s.input, s.cap, s.polarity, s.bias])).toEqual([
      ['a', { kind: 'node', name: 'in' }, 0, 'noninverting', undefined],
      ['b', { kind: 'node', name: 'a' }, 0, 'noninverting', undefined],
    ]);
    expect(m.output).toBe('b');
    expect(m.feedback).toEqual({ kind: 'factor', beta: 1 });
  });

  it('takes fields and flags in any order, and `from` anywhere', () => {
    const m = nominal(
      wrap('  node x\n  element res x gnd = 1 kohm\n  stage s inverting rout = 1 Mohm from x gm = 1 mS'),
    );
    expect(m.stages[0]!.input).toEqual({ kind: 'node', name: 'x' });
    expect(m.stages[0]!.polarity).toBe('inverting');
  });

  it('is order-independent: names may be used before they are declared', () => {
    const m = nominal(
      wrap(
        '  miller a -> b cc = cc1\n  stage b from a gm = 2 * g rout = 1 Mohm\n  stage a gm = g rout = 1 Mohm\n  param cc1 = 1 pF\n  param g = 1 mS',
      ),
    );
    expect(m.millers[0]!.cc).toBe(1e-12);
    expect(m.stages.map((s) => s.gm)).toEqual([2e-3, 1e-3]);
    expect(m.output).toBe('a'); // the last stage written
  });

  it('loads at a named node', () => {
    const m = nominal(
      wrap(
        '  stage a gm = 1 mS rout = 1 Mohm\n  stage b gm = 1 mS rout = 1 Mohm\n  load at a cap = 1 pF\n  load res = 10 kohm',
      ),
    );
    expect(m.loads.map((l) => [l.node, l.cap, l.res])).toEqual([
      ['a', 1e-12, undefined],
      ['b', undefined, 10e3],
    ]);
  });

  it('reads nested Miller as several miller lines', () => {
    const m = nominal(
      wrap(
        '  stage a gm = 1 mS rout = 1 Mohm\n  stage b gm = 1 mS rout = 1 Mohm\n  stage c gm = 1 mS rout = 1 Mohm inverting\n  miller a -> c cc = 2 pF\n  miller b -> c cc = 4 pF',
      ),
    );
    expect(m.millers.map((x) => [x.from, x.to, x.cc])).toEqual([
      ['a', 'c', 2e-12],
      ['b', 'c', 4e-12],
    ]);
  });

  it('accepts an element-only network with `out`', () => {
    const m = nominal(
      wrap(
        '  node a\n  element gm in -> a = 1 mS\n  element res a out = 1 kohm\n  element cap out gnd = 1 pF\n  element res out gnd = 1 kohm\n  output out',
      ),
    );
    expect(m.output).toBe('out');
    expect(m.stages).toEqual([]);
    expect(m.nodes.map((n) => [n.name, n.kind])).toEqual([
      ['in', 'input'],
      ['a', 'declared'],
      ['out', 'output'],
    ]);
    expect(m.elements.map((e) => e.kind)).toEqual(['gm', 'res', 'cap', 'res']);
  });

  it('uses `out` as the output of an element-only design that mentions it', () => {
    const m = nominal(wrap('  element gm in -> out = 1 mS\n  element res out gnd = 1 kohm'));
    expect(m.output).toBe('out');
  });

  it('lets a stage be named `out`', () => {
    const m = nominal(wrap('  stage out gm = 1 mS rout = 1 Mohm\n  load at out cap = 1 pF'));
    expect(m.nodes.map((n) => [n.name, n.kind])).toEqual([
      ['in', 'input'],
      ['out', 'stage'],
    ]);
  });

  it('reads <= requirements', () => {
    const m = nominal(
      wrap('  stage a gm = 1 mS rout = 1 Mohm\n  require ugf <= 1 GHz\n  require dcgain ≤ 120 dB'),
    );
    expect(m.requirements.map((r) => [r.kind, 'op' in r ? r.op : '', 'value' in r ? r.value : 0])).toEqual([
      ['ugf', '<=', 1e9],
      ['dc-gain', '<=', 120],
    ]);
  });

  it('reads several designs in one file, each on its own', () => {
    const doc = parseDocument(
      'design one\n  stage a gm = 1 mS rout = 1 Mohm\nend\n\ndesign two\n  param g = 2 mS\n  stage a gm = g rout = 1 Mohm\nend\n',
    );
    expect(doc.diagnostics).toEqual([]);
    expect(doc.designs.map((d) => [d.name, d.nominal!.stages[0]!.gm])).toEqual([
      ['one', 1e-3],
      ['two', 2e-3],
    ]);
    expect(doc.designs[1]!.text).toBe('design two\n  param g = 2 mS\n  stage a gm = g rout = 1 Mohm\nend');
  });

  it('handles CRLF and CR line ends', () => {
    const crlf = parseDocument('design d\r\n  stage a gm = 1 mS rout = 1 Mohm\r\nend\r\n');
    const cr = parseDocument('design d\r  stage a gm = 1 mS rout = 1 Mohm\rend\r');
    for (const doc of [crlf, cr]) {
      expect(doc.diagnostics).toEqual([]);
      expect(doc.designs[0]!.nominal!.stages[0]!.rout).toBe(1e6);
      expect(doc.designs[0]!.range.end).toEqual({ line: 2, character: 3 });
    }
    expect(crlf.designs[0]!.text).toBe('design d\r\n  stage a gm = 1 mS rout = 1 Mohm\r\nend');
  });

  it('evaluates parameters with their dimensions', () => {
    const m = nominal(
      wrap(
        '  param gm1 = 150 uS\n  param r = 1 / (2 * gm1)\n  param k = 3\n  param cl = 4 pF\n  param c = cl / 4\n  param x = (gm1 + 50 uS) * 3\n  stage s gm = gm1 rout = r',
      ),
    );
    const p = Object.fromEntries(m.params.map((x) => [x.name, [x.value, x.dimension]]));
    expect(p.gm1).toEqual([150e-6, 'S']);
    expect(p.r![0]).toBeCloseTo(1 / 300e-6, 9);
    expect(p.r![1]).toBe('ohm');
    expect(p.k).toEqual([3, '1']);
    expect(p.c).toEqual([1e-12, 'F']);
    expect(p.x![0]).toBeCloseTo(600e-6, 15);
    expect(p.x![1]).toBe('S');
  });
});

describe('corners', () => {
  const text = wrap(
    '  param gm1 = 100 uS\n  param gm2 = 4 * gm1\n  stage a gm = gm1 rout = 1 Mohm\n  stage b gm = gm2 rout = 100 kohm inverting\n  load cap = 1 pF\n  miller a -> b cc = 1 pF\n  feedback beta = 0.5\n' +
      '  corner slow gm1 = 80 uS, load.cap = 2 pF\n  corner rz miller.rz = 3 kohm, feedback.beta = 1, b.cap = 10 fF\n  corner bare gm1 = 90e-6',
  );
  const doc = parseDocument(text);
  const corners = Object.fromEntries(doc.designs[0]!.corners.map((c) => [c.name, c.model!]));

  it('has no diagnostics and one model per corner', () => {
    expect(doc.diagnostics).toEqual([]);
    expect(Object.keys(corners)).toEqual(['slow', 'rz', 'bare']);
  });

  it('recomputes what depends on an overridden parameter', () => {
    expect(corners.slow!.stages[0]!.gm).toBe(80e-6);
    expect(corners.slow!.stages[1]!.gm).toBeCloseTo(320e-6, 15);
    expect(corners.slow!.loads[0]!.cap).toBe(2e-12);
  });

  it('overrides fields of unique statements, adding fields not written in the nominal', () => {
    expect(corners.rz!.millers[0]!.rz).toBe(3e3);
    expect(corners.rz!.feedback).toMatchObject({ kind: 'factor', beta: 1 });
    expect(corners.rz!.stages[1]!.cap).toBe(10e-15);
    expect(doc.designs[0]!.nominal!.millers[0]!.rz).toBeUndefined();
  });

  it('gives a plain number the overridden parameter’s dimension', () => {
    expect(corners.bare!.stages[0]!.gm).toBe(90e-6);
  });
});

describe('symbols', () => {
  it('lists every declared name with its declaration and references', () => {
    const { text, ranges } = marked(
      'design ⟦d⟧\n  param ⟦g⟧ = 1 mS\n  node ⟦x⟧\n  stage ⟦s⟧ from ⟦x⟧ gm = ⟦g⟧ * 2 rout = 1 Mohm\n  element res ⟦x⟧ gnd = 1 kohm\n  miller ⟦x⟧ -> ⟦s⟧ cc = 1 pF\n  corner ⟦c⟧ ⟦g⟧ = 2 mS, ⟦s⟧.gm = ⟦g⟧\nend',
    );
    const doc = parseDocument(text);
    expect(doc.diagnostics).toEqual([]);
    const sym = Object.fromEntries(doc.designs[0]!.symbols.map((s) => [s.name, s]));
    const [d, gDecl, xDecl, sDecl, xFrom, gUse, xRes, xMiller, sMiller, c, gCorner, sCorner, gCornerValue] =
      ranges;
    expect(sym.d).toEqual({ name: 'd', kind: 'design', declaration: d, references: [] });
    expect(sym.g).toEqual({
      name: 'g',
      kind: 'param',
      declaration: gDecl,
      references: [gUse, gCorner, gCornerValue],
    });
    expect(sym.x).toEqual({
      name: 'x',
      kind: 'node',
      declaration: xDecl,
      references: [xFrom, xRes, xMiller],
    });
    expect(sym.s).toEqual({ name: 's', kind: 'stage', declaration: sDecl, references: [sMiller, sCorner] });
    expect(sym.c).toEqual({ name: 'c', kind: 'corner', declaration: c, references: [] });
  });
});

describe('corners take over what their overrides cannot reach', () => {
  const doc = parseDocument(
    wrap(
      '  param g = 1 mS\n  param h = 2 * g\n  param r = 1 Mohm\n  stage a gm = g rout = r\n  stage b gm = 3 mS rout = 1 Mohm\n  stage c gm = h rout = 1 Mohm\n  load cap = 1 pF\n' +
        '  corner x g = 2 mS\n  corner y r = -1 ohm\n  corner z c.rout = 2 Mohm',
    ),
  );
  const nominal = doc.designs[0]!.nominal!;
  const [x, y, z] = doc.designs[0]!.corners;

  it('rebuilds every statement that depends on an overridden parameter, directly or through another', () => {
    expect(x!.model!.stages.map((s) => s.gm)).toEqual([2e-3, 3e-3, 4e-3]);
    expect(x!.model!.stages[1]).toBe(nominal.stages[1]); // untouched: the nominal's own object
    expect(x!.model!.loads[0]).toBe(nominal.loads[0]);
    expect(z!.model!.stages[2]!.rout).toBe(2e6);
    expect(z!.model!.stages[0]).toBe(nominal.stages[0]);
  });

  it('still reports what goes wrong only in a corner, where it goes wrong, naming the corner', () => {
    expect(doc.diagnostics.map((d) => [d.code, d.message, d.range.start.line, d.related])).toEqual([
      [
        'plausibility',
        'In corner `y`: A resistance cannot be negative; `rout` must be positive.',
        4, // the field `rout = r` of stage a, which only corner y makes negative
        [{ range: doc.designs[0]!.symbols.find((x) => x.name === 'y')!.declaration, message: 'corner `y`' }],
      ],
    ]);
    expect(y!.model).toBeUndefined();
  });
});

describe('a corner that breaks a value', () => {
  it('has no model when its values make a nominal statement impossible, the feedback factor included', () => {
    const doc = parseDocument(
      wrap(
        '  param b = 0.5\n  stage a gm = 1 mS rout = 1 Mohm\n  feedback beta = b\n  corner neg b = -0.5\n  corner ok b = 0.25',
      ),
    );
    expect(doc.diagnostics.map((d) => d.message)).toEqual([
      'In corner `neg`: The feedback factor must be positive.',
    ]);
    const [neg, ok] = doc.designs[0]!.corners;
    expect(neg!.model).toBeUndefined();
    expect(ok!.model!.feedback).toMatchObject({ kind: 'factor', beta: 0.25 });
  });
});

describe('`load.field` in a corner', () => {
  it('means the load at the output, however it is written', () => {
    const doc = parseDocument(
      wrap(
        '  stage a gm = 1 mS rout = 1 Mohm\n  stage b gm = 1 mS rout = 1 Mohm\n  load at a cap = 1 pF\n  load at b cap = 2 pF\n  corner c load.cap = 5 pF',
      ),
    );
    expect(doc.diagnostics).toEqual([]);
    expect(doc.designs[0]!.corners[0]!.model!.loads.map((l) => [l.node, l.cap])).toEqual([
      ['a', 1e-12],
      ['b', 5e-12],
    ]);
  });
});
