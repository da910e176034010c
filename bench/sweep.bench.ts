// Figures for a sweep: 61 points of a two-stage design over three decades of load capacitance, with the
// margins' minima searched for between points; then the same with a second corner and the findings (the
// bundled example, as the editor runs it). Medians of a few runs; numbers only.
import { readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { analyzeDesignSource } from '../shared/src/service';
import { DEFAULT_CHECK_SETTINGS } from '../shared/src/checks/settings';
import { parseDocument } from '../shared/src/language';
import { specOf, sweepDesign } from '../shared/src/sweep/sweepDesign';
import { median } from './lib/timing';

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

function time(label: string, f: () => void, runs = 7): void {
  f();
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    f();
    ms.push(performance.now() - t);
  }
  console.log(`${label.padEnd(66)} ${median(ms).toFixed(1).padStart(7)} ms`);
}

const source = parseDocument(text).designs[0]!;
const spec = specOf(source, source.nominal!.sweeps![0]!)!;
time('sweep of a two-stage design, 61 points + minima between them', () => sweepDesign(source, spec));
// The figure above includes the JIT warming up (a fresh process); an editor that has run for a while
// runs the same code compiled, as here after a few dozen sweeps.
for (let i = 0; i < 30; i++) sweepDesign(source, spec);
time('the same, warm (after 30 sweeps)', () => sweepDesign(source, spec), 15);

const example = parseDocument(readFileSync('examples/twoStageLoadSweep.ampnote', 'utf8')).designs[0]!;
time('examples/twoStageLoadSweep: whole design (2 corners, checks, sweep)', () =>
  analyzeDesignSource(example, DEFAULT_CHECK_SETTINGS, undefined, { stepResponse: 'when-required' }),
);
console.log(`load average ${loadavg()[0]!.toFixed(2)}`);
