// Figures for the solve over free parameters and for a fix solved on its own rule: a two-stage design
// with three free parameters and three corners, a nested three-stage design with four free parameters and
// three corners, and the gain-margin fix of a nested design. Medians of a few runs; numbers only.
import { readFileSync } from 'node:fs';
import { DEFAULT_CHECK_SETTINGS } from '../shared/src/checks/settings';
import { parseDocument } from '../shared/src/language';
import { analyzeDocument } from '../shared/src/service';
import { solveDesign } from '../shared/src/solve/solveDesign';
import { median } from './lib/timing';

function time(label: string, f: () => { evaluations?: number } | void, runs = 7): void {
  f();
  const ms: number[] = [];
  let evaluations: number | undefined;
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    const r = f();
    ms.push(performance.now() - t);
    if (r && r.evaluations !== undefined) evaluations = r.evaluations;
  }
  console.log(
    `${label.padEnd(58)} ${median(ms).toFixed(1).padStart(7)} ms${evaluations !== undefined ? `  (${evaluations} evaluations)` : ''}`,
  );
}

const settings = DEFAULT_CHECK_SETTINGS;

const twoStage = `design two
  param id2 = 95 uA  free 20 uA .. 400 uA
  param cc  = 1.5 pF free 0.2 pF .. 5 pF
  param rz  = 500 ohm free 0 .. 5 kohm
  param gm2 = 12 /V * id2
  stage first   gm = 100 uS  rout = 2 Mohm  cap = 150 fF  bias = 10 uA
  stage second  gm = gm2  rout = 20 V / id2 || 25 V / id2  cap = 200 fF  bias = id2  inverting
  load cap = 2 pF
  miller first -> second  cc = cc  rz = rz
  require pm >= 60 deg
  require ugf >= 8 MHz
  corner slow  first.gm = 80 uS
  corner heavy load.cap = 3 pF
  corner hot   first.rout = 1.5 Mohm
end
`;

const nested = `design nested
  param c1 = 4 pF free 0.5 pF .. 20 pF
  param c2 = 4 pF free 0.5 pF .. 20 pF
  param id3 = 200 uA free 50 uA .. 1 mA
  param rz = 100 ohm free 0 .. 2 kohm
  stage first   gm = 50 uS   rout = 1 Mohm    cap = 50 fF  bias = 10 uA
  stage second  gm = 200 uS  rout = 500 kohm  cap = 100 fF  bias = 20 uA
  stage third   gm = 10 /V * id3  rout = 10 V / id3  cap = 300 fF  bias = id3  inverting
  load cap = 20 pF
  miller first  -> third  cc = c1  rz = rz
  miller second -> third  cc = c2
  require pm  >= 55 deg
  require ugf >= 1 MHz
  corner slow  first.gm = 40 uS
  corner fast  first.gm = 60 uS
  corner heavy load.cap = 30 pF
end
`;

const gmFix = `design nested_gm
  param gm1 = 50 uS
  stage first   gm = gm1     rout = 1 Mohm    cap = 50 fF
  stage second  gm = 200 uS  rout = 500 kohm  cap = 100 fF
  stage third   gm = 4 mS    rout = 50 kohm   cap = 300 fF  inverting
  load cap = 100 pF
  miller first  -> third  cc = 3 pF
  miller second -> third  cc = 3 pF
  require ugf >= 1.5 MHz
  require gainmargin >= 10 dB
end
`;

time('solve, two-stage, 3 free parameters, 3 corners', () =>
  solveDesign(parseDocument(twoStage).designs[0]!, { settings }),
);
time('solve, nested three-stage, 4 free parameters, 3 corners', () =>
  solveDesign(parseDocument(nested).designs[0]!, { settings }),
);
time('gain-margin fix of a nested design (both capacitors)', () => {
  const f = analyzeDocument(gmFix).findings.find((x) => x.code === 'gain-margin');
  void f?.fixes.length;
});
const example = readFileSync('examples/twoStageFromBiasCurrents.ampnote', 'utf8');
time('solve of examples/twoStageFromBiasCurrents (4 free, 2 corners)', () =>
  solveDesign(parseDocument(example).designs[0]!, { settings }),
);
