// Figures for the exact analysis engine: one analysis of a two-stage and of an eight-node three-stage
// design (with and without the step response), a 200-point Cc sweep, and the heap (fixes and the solve:
// solve.bench.ts) over 10⁵ analyses. Medians of repeated batches; prints numbers only.
import { analyzeDesign, sweepCompensation } from '../shared/src/analysis';
import { buildModel, twoStage } from '../test/unit/analysis/buildModel';
import { loadAverage, median, perCall, us } from './lib/timing';

/** A fixed pure-arithmetic workload, to scale the figures to another machine or load. */
function reference(): string {
  const a = new Float64Array(64).map((_, i) => Math.sin(i));
  const out = new Float64Array(64);
  return perCall(() => {
    for (let i = 0; i < 8; i++)
      for (let j = 0; j < 8; j++) {
        let s = 0;
        for (let k = 0; k < 8; k++) s += a[i * 8 + k] * a[k * 8 + j];
        out[i * 8 + j] = s;
      }
  }, 20000);
}

const two = twoStage({ gm1: 100e-6, r1: 2e6, c1: 150e-15, gm2: 1e-3, r2: 200e3, c2: 1.2e-12, cc: 1e-12 });

// Three gain stages, nested Miller with a nulling resistor in each loop, an indirect (buffered) capacitor,
// and two parasitic nodes: eight unknown node voltages.
const eight = buildModel({
  stages: [
    { name: 'first', input: 'in', gm: 50e-6, rout: 1e6, cap: 50e-15, bias: 10e-6 },
    { name: 'second', input: 'first', gm: 200e-6, rout: 500e3, cap: 100e-15, bias: 40e-6 },
    { name: 'third', input: 'second', gm: 2e-3, rout: 50e3, cap: 300e-15, inverting: true, bias: 500e-6 },
  ],
  nodes: ['pad', 'wire'],
  output: 'third',
  loads: [{ node: 'pad', cap: 20e-12, res: 100e3 }],
  millers: [
    { from: 'first', to: 'third', cc: 2.5e-12, rz: 2e3 },
    { from: 'second', to: 'third', cc: 4e-12, rz: 500 },
  ],
  buffered: [{ from: 'third', to: 'first', cc: 0.2e-12, gm: 50e-6, cap: 20e-15 }],
  elements: [
    { kind: 'res', a: 'third', b: 'wire', value: 5 },
    { kind: 'cap', a: 'wire', b: 'gnd', value: 0.5e-12 },
    { kind: 'res', a: 'wire', b: 'pad', value: 10 },
  ],
});

function main() {
  const n8 = analyzeDesign(eight);
  if (n8.problems.length) throw new Error(n8.problems[0]!.message);
  console.log(`(the eight-node design has ${n8.poles.length} poles, ${n8.zeros.length} zeros)`);
  console.log('one analysis, median per call');
  for (const [name, model] of [
    ['two-stage', two],
    ['three-stage, 8 nodes', eight],
  ] as const) {
    const core = perCall(() => analyzeDesign(model, { step: false, participation: false }), 2000);
    const checked = perCall(() => analyzeDesign(model, { step: false }), 2000);
    const full = perCall(() => analyzeDesign(model), 500);
    console.log(`  ${name}`);
    console.log(`    poles, zeros, DC gain, UGF, loop metrics, root polishing (no step)   ${core}`);
    console.log(`    + root checks and participation                                      ${checked}`);
    console.log(`    + closed-loop step response and settling (full)                      ${full}`);
  }
  const target = { kind: 'miller' as const, index: 0, field: 'cc' as const };
  const values = [0, ...Array.from({ length: 199 }, (_, i) => 1e-15 * 10 ** (i / 50))];
  console.log(
    `200-point Cc sweep (poles and zeros), two-stage   ${perCall(() => sweepCompensation(two, target, values), 20)}`,
  );
  console.log(
    `200-point Cc sweep, eight-node three-stage        ${perCall(() => sweepCompensation(eight, target, values), 10)}`,
  );

  console.log(`reference: one 8×8 matrix product (512 multiply-adds)   ${reference()}`);

  const gc = (globalThis as { gc?: () => void }).gc;
  gc?.();
  const before = process.memoryUsage().heapUsed;
  const marks: number[] = [];
  for (let i = 0; i < 100_000; i++) {
    analyzeDesign(two, { step: false });
    if (i % 20_000 === 19_999) {
      gc?.();
      marks.push(process.memoryUsage().heapUsed);
    }
  }
  const mb = (x: number) => `${(x / 1048576).toFixed(2)} MB`;
  console.log(
    `heap over 10⁵ analyses (after gc${gc ? '' : ' — unavailable, run with --expose-gc'}): start ${mb(before)}, every 2·10⁴: ${marks.map(mb).join(', ')}`,
  );
  console.log(`(machine load average while measuring: ${loadAverage()}; 2 cores shared)`);
}

main();
