// Error recovery: one mistake never hides the rest of the file, a broken statement is reported once, and
// what depends on it stays silent.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { marked } from './marked';

describe('error recovery', () => {
  it('reports five scattered mistakes at their ranges and still builds the model of the rest', () => {
    const { text, ranges } = marked(`# five mistakes, one per kind of failure
design scattered
  param gm1 = 150 ⟦uz⟧
  param gm2 = 2.2 mS
  stage first  gm = gm1 rout = 1.8 Mohm cap = 90 fF
  stage second gm = gm2 rout = 120 kohm cap = 250 fF inverting
  ⟦miler⟧ first -> second cc = 1.1 pF
  miller first -> second cc = 1.1 pF rz = ⟦1 pF⟧
  load cap = 3 pF res = 1 Mohm
  element res ⟦thrid⟧ gnd = 1 kohm
  require ugf >= 15 MHz
  require pm >= ⟦60 deg + 1 dB⟧
  require slew >= 6 V/us
end

design untouched
  stage a gm = 1 mS rout = 1 Mohm
end
`);
    const doc = parseDocument(text);
    expect(doc.diagnostics.map((d) => [d.code, d.range])).toEqual([
      ['unit', ranges[0]],
      ['syntax', ranges[1]],
      ['unit', ranges[2]],
      ['reference', ranges[3]],
      ['unit', ranges[4]],
    ]);
    const m = doc.designs[0]!.nominal!;
    // gm1 failed, so the first stage is left out; everything else is there
    expect(m.stages.map((s) => s.name)).toEqual(['second']);
    expect(m.stages[0]!.input).toEqual({ kind: 'node', name: 'first' });
    expect(m.nodes.map((n) => n.name)).toEqual(['in', 'first', 'second']);
    expect(m.loads.map((l) => [l.cap, l.res])).toEqual([[3e-12, 1e6]]);
    expect(m.millers).toEqual([]); // rz failed
    expect(m.elements).toEqual([]);
    expect(m.requirements.map((r) => r.kind)).toEqual(['ugf', 'slew']);
    expect(doc.designs[1]!.nominal!.stages[0]!.gm).toBe(1e-3);
  });

  it('does not cascade: users of a broken parameter or stage are not reported again', () => {
    const doc = parseDocument(`design d
  param a = 1 uz
  param b = 2 * a
  param c = b + a
  stage s gm = c rout = 1 Mohm
  stage t gm = 1 mS rout 1 Mohm
  miller s -> t cc = 1 pF
  corner x a = 2 uS
end`);
    expect(doc.diagnostics.map((d) => d.message)).toEqual([
      'Unknown unit `uz`.',
      'Missing `=` after `rout`.',
    ]);
    // the corner repairs `a`, so its model has stage `s`; `t` stays broken in every model
    const corner = doc.designs[0]!.corners[0]!.model!;
    expect(corner.stages.map((s) => [s.name, s.gm])).toEqual([['s', 2 * 2e-6 + 2e-6]]);
    expect(corner.millers.map((x) => x.cc)).toEqual([1e-12]);
  });

  it('keeps reading after an unknown top-level line up to the next end or design', () => {
    const doc = parseDocument(`amplifier broken
  stage a gm = 1 mS rout = 1 Mohm
  nonsense here
end
design ok
  stage a gm = 1 mS rout = 1 Mohm
end`);
    expect(doc.diagnostics.map((d) => [d.message, d.range.start.line])).toEqual([
      ['Expected `design NAME`, found `amplifier`.', 0],
    ]);
    expect(doc.designs.map((d) => d.name)).toEqual(['ok']);
  });

  it('closes a design without end at the next design line and goes on', () => {
    const doc = parseDocument(`design one
  stage a gm = 1 mS rout = 1 Mohm
design two
  stage b gm = 2 mS rout = 1 Mohm
end`);
    expect(doc.diagnostics.map((d) => d.message)).toEqual(['Design `one` has no `end`.']);
    expect(doc.designs.map((d) => [d.name, d.nominal?.stages.length, d.text])).toEqual([
      ['one', 1, 'design one\n  stage a gm = 1 mS rout = 1 Mohm'],
      ['two', 1, 'design two\n  stage b gm = 2 mS rout = 1 Mohm\nend'],
    ]);
  });

  it('reports a corner with a bad override, gives it no model, and keeps the other corners', () => {
    const doc = parseDocument(`design d
  param g = 1 mS
  stage s gm = g rout = 1 Mohm
  corner bad g = 2 pF, s.rout = 2 Mohm
  corner good g = 2 mS
end`);
    expect(doc.diagnostics.map((d) => d.code)).toEqual(['unit']);
    const [bad, good] = doc.designs[0]!.corners;
    expect(bad!.model).toBeUndefined();
    expect(good!.model!.stages[0]!.gm).toBe(2e-3);
  });

  it('yields a model for each example after any single line is deleted', () => {
    const dir = join(__dirname, '../../../examples');
    const text = readFileSync(join(dir, 'threeStageNestedMiller.ampnote'), 'utf8');
    const lines = text.split('\n');
    for (let i = 0; i < lines.length; i++) {
      const mutated = [...lines.slice(0, i), ...lines.slice(i + 1)].join('\n');
      const doc = parseDocument(mutated);
      // deleting the design line leaves no design (one diagnostic); any other line still yields the model
      if (lines[i]!.trim().startsWith('design')) {
        expect(doc.designs).toEqual([]);
        expect(doc.diagnostics.length).toBe(1);
      } else {
        expect(doc.designs.length).toBe(1);
        expect(doc.designs[0]!.nominal).toBeDefined();
      }
    }
  });
});

describe('a misspelt statement keyword', () => {
  it('is reported once; the name it meant to declare is not reported again where it is used', () => {
    const doc = parseDocument(`design d
  stag first gm = 1 mS rout = 1 Mohm
  stage second from first gm = 1 mS rout = 1 Mohm
  miller first -> second cc = 1 pF
  parm g = 1 mS
  load cap = g
end`);
    expect(doc.diagnostics.map((x) => x.message.split('.')[0])).toEqual([
      'Unknown statement `stag`',
      'Unknown statement `parm`',
    ]);
    // what used the missing names is left out of the model, the rest stays
    const m = doc.designs[0]!.nominal!;
    expect(m.stages).toEqual([]);
    expect(m.millers).toEqual([]);
    expect(m.loads).toEqual([]);
    expect(m.output).toBe('second');
  });
});

describe('misspelt block words', () => {
  it('reads a block opened by a misspelt `design` as the design it was meant to be', () => {
    const doc = parseDocument('desgin amp\n  stage a gm = 1 mS rout = 1 Mohm\nend\n');
    expect(doc.diagnostics.map((d) => [d.message, d.range])).toEqual([
      [
        'Unknown word `desgin`. Did you mean `design`?',
        { start: { line: 0, character: 0 }, end: { line: 0, character: 6 } },
      ],
    ]);
    expect(doc.designs[0]!.name).toBe('amp');
    expect(doc.designs[0]!.nominal!.stages[0]!.gm).toBe(1e-3);
  });

  it('closes a design at a misspelt `end` instead of running on', () => {
    const doc = parseDocument(
      'design one\n  stage a gm = 1 mS rout = 1 Mohm\nned\ndesign two\n  stage b gm = 1 mS rout = 1 Mohm\nend',
    );
    expect(doc.diagnostics.map((d) => [d.message, d.range.start.line])).toEqual([
      ['Unknown statement `ned`. Did you mean `end`?', 2],
    ]);
    expect(doc.designs.map((d) => d.text)).toEqual([
      'design one\n  stage a gm = 1 mS rout = 1 Mohm\nned',
      'design two\n  stage b gm = 1 mS rout = 1 Mohm\nend',
    ]);
  });
});

describe('positions', () => {
  it('counts columns in UTF-16 code units, as the editor does', () => {
    // U+1F600 takes two UTF-16 code units; U+00B5 and U+2126 one each
    const doc = parseDocument('design d\n  stage s gm = 1 mS rout = 1 kΩ cap = 2 µF 😀 x\nend');
    expect(doc.diagnostics.map((d) => [d.message, d.range])).toEqual([
      [
        'Unexpected `😀` (stage takes gm, rout, cap, bias, inverting, noninverting).',
        { start: { line: 1, character: 43 }, end: { line: 1, character: 45 } },
      ],
    ]);
    const stage = parseDocument('design d\n  stage s gm = 1 mS rout = 1 kΩ cap = 2 µF # 😀\nend').designs[0]!
      .nominal!.stages[0]!;
    expect(stage.origin.fields.cap!.range).toEqual({
      start: { line: 1, character: 38 },
      end: { line: 1, character: 42 },
    });
    expect(stage.origin.insertAt).toEqual({ line: 1, character: 42 });
    expect([stage.rout, stage.cap]).toEqual([1e3, 2e-6]);
  });
});

describe('runaway expressions', () => {
  const doc = (expr: string): ReturnType<typeof parseDocument> =>
    parseDocument(`design d\n  stage s gm = 1 mS rout = 1 Mohm\n  param x = ${expr}\n  param y = 2\nend`);

  for (const [name, expr] of [
    ['deep parentheses', '('.repeat(100_000) + '1' + ')'.repeat(100_000)],
    ['a long chain of minus signs', '- '.repeat(100_000) + '1'],
    ['a long power tower', Array(50_000).fill('2').join('^')],
    ['a long sum', Array(100_000).fill('1').join('+')],
  ] as const) {
    it(`${name}: one error, no crash, and the rest of the design still evaluates`, () => {
      const d = doc(expr);
      expect(d.diagnostics.map((x) => [x.code, x.message])).toEqual([
        [
          'syntax',
          'This expression is too long or nested too deeply (at most 400 operators and parentheses).',
        ],
      ]);
      expect(d.designs[0]!.nominal!.params.map((p) => p.name)).toEqual(['y']);
    });
  }

  it('reports at the first operator over the limit, and accepts 400', () => {
    expect(doc(Array(401).fill('1').join('+')).diagnostics).toEqual([]);
    const d = doc(Array(402).fill('1').join('+'));
    const line = `  param x = ${Array(402).fill('1').join('+')}`;
    const at = line.lastIndexOf('+');
    expect(d.diagnostics[0]!.range).toEqual({
      start: { line: 2, character: at },
      end: { line: 2, character: at + 1 },
    });
  });
});
