// One table of usual ranges, judged in one place: the docs list exactly that table, and a value outside it
// is reported once by the whole tool (language diagnostics and design findings together), not twice.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { usualRange } from '../../../shared/src/language/plausibility';
import { VALUE_RANGES, type ValueRole } from '../../../shared/src/language/valueRanges';
import { analyzeDocument } from '../../../shared/src/service';

const doc = readFileSync(join(__dirname, '../../../docs/language.md'), 'utf8');

describe('the usual ranges', () => {
  it('docs/language.md lists the table the checker uses, row for row', () => {
    const start = doc.indexOf('\n| value ');
    const section = doc.slice(start, doc.indexOf('```ampnote', start));
    const rows = section
      .split('\n')
      .filter((l) => l.startsWith('|') && !l.startsWith('| value') && !l.startsWith('| ---'))
      .map((l) =>
        l
          .split(/(?<!\\)\|/)
          .slice(1, -1)
          .map((c) => c.trim()),
      );
    const roles = Object.keys(VALUE_RANGES) as ValueRole[];
    expect(rows).toEqual(roles.map((r) => [VALUE_RANGES[r].fields, usualRange(r)]));
  });

  it('keeps a Miller capacitor to the on-chip range, 1 aF to 1 uF (common practice, as documented)', () => {
    expect(VALUE_RANGES.cap).toMatchObject({ low: 1e-18, high: 1e-6 });
  });
});

describe('a value outside its range is reported once', () => {
  const text = [
    'design once',
    '  stage first gm = 100 uS rout = 2 Mohm cap = 150 fF',
    '  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting',
    '  load cap = 1 pF',
    '  miller first -> second cc = 1.2 F',
    '  corner slow first.gm = 80 uS',
    'end',
  ].join('\n');

  it('as one warning at the value, in the parse and in the whole report', () => {
    const report = analyzeDocument(text);
    const found = report.findings.filter((f) => f.code === 'plausibility');
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({
      severity: 'warning',
      range: { start: { line: 4, character: 30 }, end: { line: 4, character: 35 } },
    });
    expect(found[0]!.message).toContain('1.2 F is far outside the usual range for an on-chip capacitance');
  });

  it('an impossible value is one error and leaves the design unjudged', () => {
    const report = analyzeDocument(text.replace('cc = 1.2 F', 'cc = -1 pF'));
    const found = report.findings.filter((f) => f.severity !== 'info');
    expect(found.map((f) => [f.code, f.severity])).toEqual([['plausibility', 'error']]);
  });
});
