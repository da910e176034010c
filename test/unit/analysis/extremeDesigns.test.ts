// Random two- and three-stage designs whose values reach the ends of double precision, through the core
// facade and the panel's data: every call returns (a generous per-call bound catches a hang), never throws, and no text for
// people shows NaN, Infinity, undefined or an object.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { measure } from '../../../shared/src/checks/measure';
import { buildPanelData } from '../../../shared/src/panel/buildPanelData';
import { analyzeDocument } from '../../../shared/src/service';

/** Generous: an ordinary design takes a few milliseconds; a hang takes forever. */
const PER_CALL_MS = 1000;

// Ordinary values beside the extremes: the language's own limits (1e±30), the ends of double range
// (IEEE 754: 5e-324 subnormal, 1.8e308 largest), zero, and a negative value.
const magnitude = fc.constantFrom(
  '1',
  '3.3',
  '47',
  '1e-30',
  '1e30',
  '1e-300',
  '1e300',
  '5e-324',
  '1e308',
  '1e-320',
  '0',
  '-2',
);
const value = (prefix: string, unit: string) =>
  fc.oneof(
    { weight: 3, arbitrary: fc.constantFrom(`${prefix === '' ? '' : '1'} ${prefix}${unit}`.trim()) },
    {
      weight: 4,
      arbitrary: fc.tuple(magnitude, fc.constantFrom('', prefix)).map(([m, p]) => `${m} ${p}${unit}`),
    },
  );

const stage = (name: string, input: string, inverting: boolean) =>
  fc
    .record({
      gm: value('u', 'S'),
      rout: value('k', 'ohm'),
      cap: value('f', 'F'),
      bias: fc.option(value('u', 'A'), { nil: undefined }),
    })
    .map(
      (s) =>
        `  stage ${name} gm = ${s.gm}  rout = ${s.rout}  cap = ${s.cap}` +
        `${s.bias ? `  bias = ${s.bias}` : ''}${inverting ? '  inverting' : ''}`,
    );

const requirement = fc.constantFrom(
  '  require pm >= 60 deg',
  '  require ugf >= 1 MHz',
  '  require dcgain >= 60 dB',
  '  require dcgain <= 300 dB',
  '  require gainmargin >= 10 dB',
  '  require slew >= 1 V/us',
  '  require zero >= 10 * ugf',
  '  require settle 0.1 % within 500 ns',
  '  require settle 1e-320 within 500 ns',
  '  require settle 1e-13 % within 1 us',
  '  require settle 5e-324 within 1e308 s',
);

const design = fc
  .record({
    three: fc.boolean(),
    s1: stage('first', 'in', false),
    s2: stage('second', 'first', false),
    s3: stage('third', 'second', true),
    s2inv: stage('second', 'first', true),
    load: fc.tuple(value('p', 'F'), value('k', 'ohm')).map(([c, r]) => `  load cap = ${c} res = ${r}`),
    cc: value('p', 'F'),
    cc2: value('p', 'F'),
    rz: fc.option(value('k', 'ohm'), { nil: undefined }),
    requirements: fc.array(requirement, { maxLength: 4 }),
    corner: fc.option(value('p', 'F'), { nil: undefined }),
    element: fc.option(value('', 'ohm'), { nil: undefined }),
  })
  .map((d) => {
    const out = d.three ? 'third' : 'second';
    return [
      'design random',
      d.s1,
      d.three ? d.s2 : d.s2inv,
      ...(d.three ? [d.s3] : []),
      d.load,
      `  miller first -> ${out} cc = ${d.cc}${d.rz ? ` rz = ${d.rz}` : ''}`,
      ...(d.three ? [`  miller second -> third cc = ${d.cc2}`] : []),
      ...(d.element ? [`  element res ${out} gnd = ${d.element}`] : []),
      ...d.requirements,
      ...(d.corner ? [`  corner heavy miller.cc = ${d.corner}`] : []),
      'end',
    ].join('\n');
  });

// "is undefined" is English (a node voltage no element fixes); any other `undefined` is a missing value.
const FORBIDDEN = /NaN|Infinity|(?<!is )undefined|\[object/;

describe('random designs with extreme values through analyzeDocument', () => {
  it('return within a second each, never throw, and show only words and digits', () => {
    fc.assert(
      fc.property(design, (text) => {
        const start = performance.now();
        const report = analyzeDocument(text);
        const texts: string[] = [];
        for (const f of report.findings) {
          texts.push(f.message, ...f.related.map((r) => r.message));
        }
        for (const d of report.designs) {
          for (const run of d.runs) {
            for (const req of run.model.requirements) {
              const m = measure(req, run.analysis);
              texts.push(m.label, m.measured, m.required, m.margin ?? '');
            }
          }
        }
        for (const d of report.designs) {
          // The panel draws the nominal model (its Cc sweep, loop gain and step) from the same values.
          if (d.source.nominal) {
            const panel = buildPanelData(d.source.nominal, 'file:///random.ampnote');
            texts.push(
              ...(panel?.problems ?? []),
              panel?.summary.dcGainText ?? '',
              panel?.step.unavailable ?? '',
            );
          }
        }
        const elapsed = performance.now() - start;
        expect(elapsed, text).toBeLessThan(PER_CALL_MS);
        for (const t of texts) expect(t, text).not.toMatch(FORBIDDEN);
      }),
      { numRuns: 150 },
    );
  });
});
