// The shared line splitter counts lines exactly as the parser does (\n, \r\n and lone \r end a line), so
// any position computed at an adapter agrees with the positions in the parsed document.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { firstLine, lineStarts, splitLines } from '../../../shared/src/text/lines';

describe('line splitter', () => {
  it('splits on \\n, \\r\\n and lone \\r, and keeps an empty last line', () => {
    // The three line endings of the Language Server Protocol (specification, "Text Documents").
    expect(splitLines('a\nb\r\nc\rd').lines).toEqual(['a', 'b', 'c', 'd']);
    expect(splitLines('a\r\r\nb\n').lines).toEqual(['a', '', 'b', '']);
    expect(splitLines('').lines).toEqual(['']);
    expect(lineStarts('a\nb\r\nc\rd')).toEqual([0, 2, 5, 7]);
    expect(firstLine('abc\rdef')).toBe('abc');
    expect(firstLine('abc\r\n')).toBe('abc');
    expect(firstLine('abc')).toBe('abc');
  });

  it('joined with the breaks it removed gives the text back, for any text', () => {
    fc.assert(
      fc.property(fc.array(fc.constantFrom('a', ' ', '\n', '\r', '\r\n', 'µ', '😀')), (parts) => {
        const text = parts.join('');
        const { lines, offsets } = splitLines(text);
        expect(offsets.length).toBe(lines.length);
        for (let i = 0; i < lines.length; i++) expect(text.startsWith(lines[i]!, offsets[i])).toBe(true);
        const breaks = offsets.slice(1).map((o, i) => text.slice(offsets[i]! + lines[i]!.length, o));
        for (const b of breaks) expect(['\n', '\r', '\r\n']).toContain(b);
      }),
      { numRuns: 300 },
    );
  });

  it('agrees with the parser on where a design ends, whatever the line endings', () => {
    for (const br of ['\n', '\r\n', '\r']) {
      const text = ['design d', '  stage s gm = 1 mS rout = 1 Mohm cap = 1 pF', 'end', ''].join(br);
      const end = parseDocument(text).designs[0]!.range.end;
      const lines = splitLines(text).lines;
      expect(end.line).toBe(2);
      expect(end.character).toBe(lines[2]!.length);
    }
  });
});
