// `require settle TOL within TIME step AMPLITUDE`: the step is read into the model in volts, and every bad
// amplitude is one diagnostic at its place while the rest of the design is still read.
import { describe, expect, it } from 'vitest';
import { parseDocument } from '../../../shared/src/language';
import { marked } from './marked';

const design = (line: string) =>
  `design d\n  stage s gm = 1 mS rout = 1 Mohm bias = 10 uA\n  load cap = 1 pF\n${line}\n  require pm >= 60 deg\nend\n`;

describe('require settle … step', () => {
  it('reads the amplitude in volts (a plain number too) and keeps the small-signal form without it', () => {
    const settle = (line: string) => {
      const doc = parseDocument(design(line));
      expect(doc.diagnostics).toEqual([]);
      return doc.designs[0]!.nominal!.requirements.find((r) => r.kind === 'settle');
    };
    expect(settle('  require settle 0.1 % within 200 ns step 500 mV')).toMatchObject({ step: 0.5 });
    expect(settle('  require settle 0.1 % within 200 ns step 2')).toMatchObject({ step: 2 });
    expect(settle('  require settle 0.1 % within 200 ns')).not.toHaveProperty('step');
  });

  const cases: [title: string, line: string, code: string, message: string][] = [
    [
      'a zero step',
      '  require settle 0.1 % within 200 ns step ⟦0 V⟧',
      'plausibility',
      'A step amplitude must be positive.',
    ],
    [
      'a negative step',
      '  require settle 0.1 % within 200 ns step ⟦-1 V⟧',
      'plausibility',
      'A step amplitude must be positive.',
    ],
    [
      'a step in the wrong unit',
      '  require settle 0.1 % within 200 ns step ⟦1 mA⟧',
      'unit',
      '`step` expects a voltage (V), but this is a current (A).',
    ],
    [
      'a missing amplitude',
      '  require settle 0.1 % within 200 ns ⟦step⟧',
      'syntax',
      'Missing the step amplitude after `step` (e.g. `step 1 V`).',
    ],
    [
      'a value too large to compute with',
      '  require settle 0.1 % within 200 ns step ⟦1e400 V⟧',
      'plausibility',
      '',
    ],
  ];
  for (const [title, line, code, message] of cases)
    it(`reports ${title} at the amplitude, and reads the rest of the design`, () => {
      const { text, ranges } = marked(design(line));
      const doc = parseDocument(text);
      expect(doc.diagnostics.map((x) => ({ code: x.code, severity: x.severity, range: x.range }))).toEqual([
        { code, severity: 'error', range: ranges[0] },
      ]);
      if (message) expect(doc.diagnostics[0]!.message).toBe(message);
      const model = doc.designs[0]!.nominal!;
      expect(model.requirements.map((r) => r.kind)).toEqual(['pm']);
      expect(model.stages.map((s) => s.name)).toEqual(['s']);
    });
});
