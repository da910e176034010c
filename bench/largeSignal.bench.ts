// Figures for the large-signal step (analysis/largeSignalStep.ts): a two-stage design slewing a 1 V step,
// and an eight-node three-stage nested-Miller design (an input RC, two output branches and the nulling
// resistors' junctions) slewing 0.5 V.
// The step's own time is the whole analysis less the same analysis without the step requirement, wall clock
// and CPU (the CPU figure is steadier on a shared machine). Medians after a warm-up; numbers only.
import { loadavg } from 'node:os';
import { analyzeDesign } from '../shared/src/analysis';
import { parseDocument } from '../shared/src/language';
import type { DesignModel } from '../shared/src/language/model';
import { median } from './lib/timing';

/** Median wall-clock and CPU (user + system) milliseconds of one call, after a warm-up. */
function ms(f: () => void, runs = 15): { wall: number; cpu: number } {
  for (let i = 0; i < 10; i++) f();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c = process.cpuUsage();
    const t = performance.now();
    f();
    wall.push(performance.now() - t);
    const d = process.cpuUsage(c);
    cpu.push((d.user + d.system) / 1000);
  }
  return { wall: median(wall), cpu: median(cpu) };
}

const twoStage = `design sc
  stage first  gm = 200 uS rout = 5 Mohm cap = 50 fF bias = 10 uA
  stage second gm = 2 mS rout = 200 kohm cap = 100 fF bias = 100 uA inverting
  load cap = 2 pF
  miller first -> second cc = 1 pF
  require settle 0.1 % within 1 us step 1 V
end
`;

const threeStage = `design nested
  node a, esr, b
  element res in a = 1 kohm
  element cap a gnd = 100 fF
  stage first from a gm = 100 uS rout = 5 Mohm cap = 50 fF bias = 10 uA
  stage second gm = 400 uS rout = 500 kohm cap = 80 fF bias = 40 uA
  stage third  gm = 4 mS rout = 50 kohm cap = 200 fF bias = 400 uA inverting
  element res third esr = 20 ohm
  element cap esr gnd = 3 pF
  element res third b = 50 ohm
  element cap b gnd = 200 fF
  miller first -> third cc = 2 pF rz = 300 ohm
  miller second -> third cc = 1 pF rz = 2 kohm
  require settle 0.1 % within 2 us step 500 mV
end
`;

for (const [label, text] of [
  ['two-stage, 1 V step', twoStage],
  ['8-node three-stage nested Miller, 0.5 V step', threeStage],
] as const) {
  const model = parseDocument(text).designs[0]!.nominal!;
  const bare: DesignModel = { ...model, requirements: [] };
  const a = analyzeDesign(model);
  const l = a.largeSignalStep;
  const n = a.poles.length;
  const whole = ms(() => analyzeDesign(model));
  const without = ms(() => analyzeDesign(bare));
  const label2 = `large-signal step, ${label} (${l ? `${l.samples.t.length} samples` : a.largeSignalStepUnavailable}, ${n} poles)`;
  console.log(
    `${label2.padEnd(84)} ${(whole.wall - without.wall).toFixed(1).padStart(6)} ms wall, ${(whole.cpu - without.cpu).toFixed(1).padStart(6)} ms CPU`,
  );
}
console.log(`load average ${loadavg()[0]!.toFixed(2)}`);
