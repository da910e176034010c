// Piece-wise parsing must give exactly what a whole-text parse gives, for any text.
import fc from 'fast-check';
import { readdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createParseCache, splitAtDesigns } from '../../../shared/src/incrementalParse';
import { parseDocument } from '../../../shared/src/language';

const ROOT = resolve(__dirname, '../../..');
const examples = readdirSync(resolve(ROOT, 'examples'))
  .filter((f) => f.endsWith('.ampnote'))
  .map((f) => readFileSync(resolve(ROOT, 'examples', f), 'utf8'));

const LINES = [
  'design a',
  'design b',
  '  design c   # indented',
  'designer x',
  'end',
  'end extra',
  '  param gm1 = 100 uS',
  '  param gm2 = 4 * gm1',
  '  stage first gm = gm1 rout = 2 Mohm cap = 150 fF',
  '  stage second gm = gm2 rout = 200 kohm cap = 200 fF inverting',
  '  load cap = 1 pF',
  '  miller first -> second cc = 1 pF',
  '  require pm >= 60 deg',
  '  corner slow gm1 = 80 uS',
  '  stage = = =',
  '# design commented',
  '',
  '  cc = 1.2 F',
];

describe('piece-wise parsing', () => {
  it('cuts before design lines only', () => {
    const pieces = splitAtDesigns('# head\ndesign a\nend\r\ndesign b\rend\n  design c\nend');
    expect(pieces.map((p) => [p.startLine, p.text])).toEqual([
      [0, '# head\n'],
      [1, 'design a\nend\r\n'],
      [3, 'design b\rend\n'],
      [5, '  design c\nend'],
    ]);
  });

  it('equals the whole-text parse on the examples, joined and reordered', () => {
    const cache = createParseCache();
    for (const text of [...examples, examples.join('\n'), [...examples].reverse().join('\r\n')]) {
      expect(cache.parse(text)).toEqual(parseDocument(text));
    }
  });

  it('equals the whole-text parse on random documents, also when reusing pieces of the previous text', () => {
    const doc = fc
      .array(fc.tuple(fc.constantFrom(...LINES), fc.constantFrom('\n', '\r\n', '\r')), { maxLength: 40 })
      .map((xs) => xs.map(([l, nl]) => l + nl).join(''));
    fc.assert(
      fc.property(doc, doc, (a, b) => {
        const cache = createParseCache();
        expect(cache.parse(a)).toEqual(parseDocument(a));
        expect(cache.parse(b)).toEqual(parseDocument(b));
        expect(cache.parse(a + b)).toEqual(parseDocument(a + b));
        expect(cache.parse(b + a)).toEqual(parseDocument(b + a));
      }),
      { numRuns: 300 },
    );
  });

  it('divides a first whole parse among many pieces, then reuses them', () => {
    const body = fc.array(
      fc.tuple(
        fc.constantFrom(...LINES.filter((l) => !/^\s*design /.test(l))),
        fc.constantFrom('\n', '\r\n'),
      ),
      {
        maxLength: 8,
      },
    );
    const docs = fc
      .array(body, { minLength: 10, maxLength: 16 })
      .map((designs) =>
        designs.map((lines, i) => `design d${i}\n` + lines.map(([l, nl]) => l + nl).join('')).join(''),
      );
    fc.assert(
      fc.property(docs, fc.nat(), (text, k) => {
        const cache = createParseCache();
        expect(cache.parse(text)).toEqual(parseDocument(text));
        const lines = text.split('\n');
        const at = k % lines.length;
        lines.splice(at, 0, '  param extra = 3 pF');
        const edited = lines.join('\n');
        expect(cache.parse(edited)).toEqual(parseDocument(edited));
        expect(cache.parse(text)).toEqual(parseDocument(text));
      }),
      { numRuns: 150 },
    );
  });
});
