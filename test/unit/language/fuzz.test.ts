// Property-based tests: whatever the text, the parser returns a document and diagnostics, never throws,
// places every range inside the text, and puts only finite numbers into models.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import type { ParsedDocument } from '../../../shared/src/language/model';
import { LANGUAGE_WORDS, OPERATORS } from '../../fuzzWords';

const dir = join(__dirname, '../../../examples');
const examples = readdirSync(dir)
  .filter((f) => f.endsWith('.ampnote'))
  .sort()
  .map((f) => readFileSync(join(dir, f), 'utf8'));

function lineLengths(text: string): number[] {
  return text.split(/\r\n|\r|\n/).map((l) => l.length);
}

/** Every problem found in the result: ranges outside the text, reversed ranges, non-finite model numbers. */
function problems(text: string, doc: ParsedDocument): string[] {
  const lengths = lineLengths(text);
  const out: string[] = [];
  const inside = (p: { line: number; character: number }): boolean =>
    Number.isInteger(p.line) &&
    Number.isInteger(p.character) &&
    p.line >= 0 &&
    p.line < lengths.length &&
    p.character >= 0 &&
    p.character <= lengths[p.line]!;
  const walk = (v: unknown, path: string, inModel: boolean): void => {
    if (typeof v === 'number') {
      if (inModel && !Number.isFinite(v)) out.push(`${path} = ${v}`);
      return;
    }
    if (!v || typeof v !== 'object') return;
    const o = v as Record<string, unknown>;
    const start = o.start as { line: number; character: number } | undefined;
    const end = o.end as { line: number; character: number } | undefined;
    if (start && end && typeof start.line === 'number' && typeof end.line === 'number') {
      if (!inside(start) || !inside(end)) out.push(`${path}: range outside the text`);
      if (start.line > end.line || (start.line === end.line && start.character > end.character))
        out.push(`${path}: reversed range`);
    }
    for (const [k, x] of Object.entries(o))
      walk(x, `${path}.${k}`, inModel || k === 'nominal' || k === 'model');
  };
  walk(doc, 'doc', false);
  if (!Array.isArray(doc.designs) || !Array.isArray(doc.diagnostics)) out.push('not a document');
  return out;
}

const vocabulary = [
  ...LANGUAGE_WORDS,
  ...OPERATORS,
  'a',
  'b',
  'first',
  'second',
  'gm1',
  'x_2',
  '# note',
  '1',
  '0',
  '2.2',
  '.5',
  '1e-12',
  '1.2.3',
  '5e',
  '1e999',
  '1e308',
  '1e-320',
  '|',
  'uA/V^2',
  '/V',
  'V^-1',
  'Meg',
  'pF',
  'fF',
  'uS',
  'mS',
  'Mohm',
  'mohm',
  'kΩ',
  'µF',
  'V/us',
  'A/V',
  'deg',
  '°',
  'dB',
  'ppm',
  'M',
  'k',
  'Kohm',
  '−',
  '×',
  '😀',
  '\t',
  ';',
  '"',
  '\u00a0',
  '\u2028',
];
const token = fc.constantFrom(...vocabulary);
const lineBreak = fc.constantFrom('\n', '\r\n', '\r');
const soupLine = fc.array(token, { maxLength: 12 }).map((ts) => ts.join(' '));
const soup = fc
  .array(fc.tuple(soupLine, lineBreak), { maxLength: 30 })
  .map((ls) => ls.map(([l, br]) => l + br).join(''));
const statementLine = fc
  .tuple(
    fc.constantFrom(
      'param',
      'node',
      'stage',
      'load',
      'miller',
      'indirect',
      'feedforward',
      'element',
      'output',
      'feedback',
      'require',
      'corner',
    ),
    soupLine,
  )
  .map(([k, rest]) => `${k} ${rest}`);
/** Token soup framed in design blocks, lines mostly opening with a statement keyword, so that the statement parsers get exercised. */
const framed = fc
  .array(fc.array(fc.oneof(statementLine, statementLine, soupLine), { maxLength: 12 }), {
    minLength: 1,
    maxLength: 3,
  })
  .map((designs) =>
    designs.map((body, i) => `design d${i}\n${body.map((l) => `  ${l}`).join('\n')}\nend`).join('\n'),
  );

const mutation = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(), length: fc.nat({ max: 8 }) }),
  fc.record({
    kind: fc.constant('insert' as const),
    at: fc.nat(),
    text: fc.oneof(token, fc.string({ maxLength: 4 })),
  }),
  fc.record({ kind: fc.constant('swapLines' as const), at: fc.nat(), other: fc.nat() }),
  fc.record({ kind: fc.constant('duplicateLine' as const), at: fc.nat() }),
);
type Mutation = typeof mutation extends fc.Arbitrary<infer M> ? M : never;

function mutate(text: string, ms: Mutation[]): string {
  for (const m of ms) {
    if (m.kind === 'delete') {
      const at = m.at % (text.length + 1);
      text = text.slice(0, at) + text.slice(at + m.length);
    } else if (m.kind === 'insert') {
      const at = m.at % (text.length + 1);
      text = text.slice(0, at) + m.text + text.slice(at);
    } else {
      const lines = text.split('\n');
      const i = m.at % lines.length;
      if (m.kind === 'duplicateLine') lines.splice(i, 0, lines[i]!);
      else {
        const j = m.other % lines.length;
        [lines[i], lines[j]] = [lines[j]!, lines[i]!];
      }
      text = lines.join('\n');
    }
  }
  return text;
}

function check(text: string): void {
  let doc: ParsedDocument | undefined;
  expect(() => (doc = parseDocument(text))).not.toThrow();
  expect(problems(text, doc!)).toEqual([]);
  // deterministic: the same text gives the same result
  expect(parseDocument(text)).toEqual(doc);
}

describe('fuzzing', () => {
  it('token soup', () => {
    fc.assert(fc.property(soup, check), { numRuns: 400 });
  });

  it('token soup inside design blocks', () => {
    fc.assert(fc.property(framed, check), { numRuns: 400 });
  });

  it('arbitrary strings', () => {
    fc.assert(fc.property(fc.string({ maxLength: 200, unit: 'binary' }), check), { numRuns: 300 });
  });

  it('mutations of the examples', () => {
    fc.assert(
      fc.property(
        fc.nat({ max: examples.length - 1 }),
        fc.array(mutation, { minLength: 1, maxLength: 6 }),
        (i, ms) => check(mutate(examples[i]!, ms)),
      ),
      { numRuns: 400 },
    );
  });

  it('the check itself catches a range outside the text', () => {
    const doc = parseDocument('design d\n  stage s gm = 1 mS rout = 1 Mohm\nend');
    const shifted = JSON.parse(JSON.stringify(doc).replace(/"line":2/g, '"line":7')) as ParsedDocument;
    expect(problems('design d\n  stage s gm = 1 mS rout = 1 Mohm\nend', shifted)).not.toEqual([]);
  });
});

/** The text between two positions of a document (LSP positions: line, UTF-16 column). */
function slice(
  text: string,
  r: { start: { line: number; character: number }; end: { line: number; character: number } },
): string {
  const starts = [0];
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === '\r' && text[i + 1] === '\n') continue;
    if (c === '\n' || c === '\r') starts.push(i + 1);
  }
  return text.slice(starts[r.start.line]! + r.start.character, starts[r.end.line]! + r.end.character);
}

/** A model without its text positions, to compare models of texts that differ in layout. */
function shape(value: unknown): unknown {
  return JSON.parse(
    JSON.stringify(value, (k, v) =>
      [
        'range',
        'keywordRange',
        'insertAt',
        'origin',
        'nameRange',
        'declaration',
        'references',
        'text',
      ].includes(k)
        ? undefined
        : v,
    ),
  );
}

describe('properties of valid designs', () => {
  it('a design’s text is exactly the document between its range’s ends, for any input', () => {
    fc.assert(
      fc.property(
        fc.oneof(
          framed,
          fc.nat({ max: examples.length - 1 }).map((i) => examples[i]!),
        ),
        (text) => {
          for (const d of parseDocument(text).designs) expect(d.text).toBe(slice(text, d.range));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('every field origin’s text is the text at its range', () => {
    for (const text of examples)
      for (const d of parseDocument(text).designs)
        for (const m of [d.nominal!, ...d.corners.map((c) => c.model!)])
          for (const item of [
            ...m.stages,
            ...m.loads,
            ...m.millers,
            ...m.elements,
            ...m.requirements,
            ...m.params,
          ])
            for (const f of Object.values(item.origin.fields)) expect(slice(text, f.range)).toBe(f.text);
  });

  it('comments and blank lines change no model', () => {
    fc.assert(
      fc.property(
        fc.nat({ max: examples.length - 1 }),
        fc.array(fc.tuple(fc.nat(), fc.constantFrom('   # a remark', '', '# design x', '  #end')), {
          maxLength: 8,
        }),
        (i, edits) => {
          const lines = examples[i]!.split('\n');
          for (const [at, extra] of edits) {
            const k = at % lines.length;
            if (extra.startsWith('   #')) lines[k] = `${lines[k]}${extra}`;
            else lines.splice(k, 0, extra);
          }
          const edited = parseDocument(lines.join('\n'));
          expect(edited.diagnostics).toEqual([]);
          expect(shape(edited.designs)).toEqual(shape(parseDocument(examples[i]!).designs));
        },
      ),
      { numRuns: 200 },
    );
  });

  it('a design means the same alone and among others', () => {
    fc.assert(
      fc.property(fc.array(fc.nat({ max: examples.length - 1 }), { minLength: 2, maxLength: 4 }), (picks) => {
        const texts = picks.map((p, k) => examples[p]!.replace(/^design (\w+)/m, `design $1_${k}`));
        const together = parseDocument(texts.join('\n'));
        expect(together.diagnostics).toEqual([]);
        expect(shape(together.designs)).toEqual(shape(texts.flatMap((t) => parseDocument(t).designs)));
      }),
      { numRuns: 50 },
    );
  });

  it('the order of statements does not matter, apart from stages (their order sets the default inputs)', () => {
    const base = examples.find((t) => t.includes('design headphone_driver'))!;
    const lines = base.split('\n');
    const first = lines.findIndex((l) => l.startsWith('design'));
    const last = lines.findIndex((l) => l.startsWith('end'));
    const body = lines.slice(first + 1, last).filter((l) => l.trim() && !l.trim().startsWith('#'));
    const stages = body.filter((l) => l.trim().startsWith('stage'));
    const others = body.filter((l) => !l.trim().startsWith('stage'));
    const sortModel = (m: unknown): unknown => {
      const o = shape(m) as Record<string, unknown>;
      for (const k of Object.keys(o))
        if (Array.isArray(o[k])) o[k] = (o[k] as unknown[]).map((x) => JSON.stringify(x)).sort();
      return o;
    };
    const reference = parseDocument(base).designs[0]!;
    fc.assert(
      fc.property(
        fc.shuffledSubarray(others, { minLength: others.length }),
        fc.nat({ max: others.length }),
        (shuffled, at) => {
          const mixed = [...shuffled.slice(0, at), ...stages, ...shuffled.slice(at)];
          const doc = parseDocument([lines[first], ...mixed, 'end'].join('\n'));
          expect(doc.diagnostics).toEqual([]);
          const d = doc.designs[0]!;
          expect(sortModel(d.nominal)).toEqual(sortModel(reference.nominal));
          // corners are listed in the order written
          const byName = (cs: typeof d.corners): unknown[] =>
            [...cs].sort((a, b) => a.name.localeCompare(b.name)).map((c) => sortModel(c.model));
          expect(byName(d.corners)).toEqual(byName(reference.corners));
        },
      ),
      { numRuns: 100 },
    );
  });
});
