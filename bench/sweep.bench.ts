// Figures for a sweep: 61 points of a two-stage design over three decades of load capacitance, with the
// margins' minima searched for between points. Medians of a few runs; numbers only.
import { parseDocument } from '../shared/src/language';
import { specOf, sweepDesign } from '../shared/src/sweep/sweepDesign';

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

const text = `design buf
  param cl = 10 pF
  stage first  gm = 100 uS rout = 2 Mohm cap = 150 fF
  stage second gm = 1 mS rout = 200 kohm cap = 200 fF inverting
  node esr
  element res second esr = 300 ohm
  element cap esr gnd = cl
  miller first -> second cc = 2 pF
  require pm >= 45 deg
  sweep cl from 1 pF to 1 nF
end
`;

const source = parseDocument(text).designs[0]!;
const spec = specOf(source.nominal!.sweeps![0]!);
let evaluations = 0;
const run = () => {
  const r = sweepDesign(source, spec);
  evaluations = r.samples.length;
  return r;
};
run();
const ms: number[] = [];
for (let i = 0; i < 7; i++) {
  const t = performance.now();
  run();
  ms.push(performance.now() - t);
}
console.log(
  `${'sweep of a two-stage design, 61 points + minima between them'.padEnd(58)} ${median(ms).toFixed(1).padStart(7)} ms  (${evaluations} points)`,
);
