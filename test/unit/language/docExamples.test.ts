// Every ```ampnote block of docs/language.md is parsed: a block whose first line is `# expect: CODE …` must
// produce exactly those diagnostic codes, in order of position; any other block must produce none.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  BUILTIN_NODES,
  ELEMENT_KINDS,
  FIELDS_BY_STATEMENT,
  FLAGS_BY_STATEMENT,
  KEYWORDS,
  parseDocument,
  REQUIREMENT_KINDS,
  STATEMENT_KEYWORDS,
} from '../../../shared/src/language';
import { FUNCTION_NAMES } from '../../../shared/src/language/expressionFunctions';

const doc = readFileSync(join(__dirname, '../../../docs/language.md'), 'utf8');
const blocks = [...doc.matchAll(/```ampnote\n([\s\S]*?)```/g)].map((m) => m[1]!);

describe('docs/language.md examples', () => {
  it('has examples, valid ones and ones showing each diagnostic code', () => {
    expect(blocks.length).toBeGreaterThanOrEqual(6);
    const expected = blocks.flatMap(
      (b) => /^# expect: (.*)$/m.exec(b.split('\n')[0]!)?.[1]!.split(/\s+/) ?? [],
    );
    for (const code of ['syntax', 'unit', 'reference', 'plausibility']) expect(expected).toContain(code);
  });

  blocks.forEach((block, i) => {
    const expect_ = /^# expect: (.*)$/.exec(block.split('\n')[0]!);
    const codes = expect_ ? expect_[1]!.trim().split(/\s+/) : [];
    it(`block ${i + 1} (${codes.length ? codes.join(', ') : 'valid'})`, () => {
      const parsed = parseDocument(block);
      expect(parsed.diagnostics.map((d) => d.code)).toEqual(codes);
      expect(parsed.designs.length).toBeGreaterThan(0);
      if (!codes.length) for (const d of parsed.designs) expect(d.nominal).toBeDefined();
    });
  });
});

describe('docs/language.md covers the vocabulary', () => {
  const words = new Set([
    ...KEYWORDS,
    ...STATEMENT_KEYWORDS,
    ...ELEMENT_KINDS,
    ...REQUIREMENT_KINDS,
    ...BUILTIN_NODES,
    ...Object.values(FIELDS_BY_STATEMENT).flat(),
    ...Object.values(FLAGS_BY_STATEMENT).flat(),
    ...FUNCTION_NAMES,
  ]);
  const fenced = [...doc.matchAll(/```[a-z]*\n([\s\S]*?)```/g)].map((m) => m[1]!);
  const prose = doc.replace(/```[a-z]*\n[\s\S]*?```/g, '');
  const code = [...fenced, ...[...prose.matchAll(/`([^`\n]+)`/g)].map((m) => m[1]!)];
  for (const w of words)
    it(`mentions \`${w}\``, () => {
      // inside some inline code span (`w`, `w NAME …`) or code block
      expect(code.some((span) => new RegExp(`(^|[^A-Za-z0-9_])${w}([^A-Za-z0-9_]|$)`).test(span))).toBe(true);
    });

  it('has a section for every statement', () => {
    for (const k of STATEMENT_KEYWORDS) expect(doc).toMatch(new RegExp(`^### \`${k}\\b`, 'm'));
  });
});
