// Every ```ampnote block of docs/language.md is parsed: a block whose first line is `# expect: CODE …` must
// produce exactly those diagnostic codes, in order of position; any other block must produce none.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';

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
