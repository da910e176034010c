// Figures for a loop written as a circuit (`feedback at`): one analysis of an invented ten-node regulator
// (the loop gain from the break, the closed circuit's poles, gain, output impedance, load step and supply
// rejection). Medians of repeated batches; prints numbers only, never judges them.
import { analyzeDesign, buildNetwork } from '../shared/src/analysis';
import { analyzeLoop } from '../shared/src/analysis/loopCore';
import { parseDocument } from '../shared/src/language';
import { loadAverage, perCall } from './lib/timing';

// An invented regulator: a reference filter, a two-stage error amplifier with a nulling-resistor Miller
// capacitor, an inverting gate driver, a pass transconductor from the supply, a divider with a series-RC
// feed-forward branch, an output capacitor with ESR, and a bond-wire resistance to a decoupled pad.
const REGULATOR = `design regulator10
  supply vdd
  node reff, fb, ffmid, esr, pad
  element res in reff = 100 kohm
  element cap reff gnd = 10 pF
  stage ea1 from fb, reff gm = 100 uS rout = 200 kohm cap = 100 fF
  stage ea2 gm = 500 uS rout = 50 kohm cap = 200 fF inverting
  stage gate gm = 2 mS rout = 2 kohm cap = 2 pF inverting
  miller ea1 -> ea2 cc = 0.2 pF rz = 5 kohm
  element gm vdd, gate -> out = 5 mS
  element res vdd out = 2 kohm
  element cap vdd gate = 1 pF
  element res out fb = 400 kohm
  element res fb gnd = 100 kohm
  element res out ffmid = 20 kohm
  element cap ffmid fb = 20 pF
  element cap fb gnd = 0.5 pF
  element res out esr = 100 mohm
  element cap esr gnd = 2.2 uF
  element res out pad = 50 mohm
  element cap pad gnd = 100 nF
  load at pad res = 50 ohm
  output out
  feedback at fb
end
`;

function main() {
  const doc = parseDocument(REGULATOR);
  const model = doc.designs[0]!.nominal!;
  const built = buildNetwork(model);
  if (!built.ok) throw new Error(built.problems[0]!.message);
  const a = analyzeDesign(model);
  if (a.problems.length) throw new Error(a.problems[0]!.message);
  const cc = a.closedCircuit!;
  console.log(
    `(the regulator has ${built.network.n} unknown node voltages; T(s): ${a.poles.length} poles, ` +
      `${a.zeros.length} zeros, T(0) = ${a.dcGain.toPrecision(4)}, PM ${a.loop.phaseMarginDeg?.toFixed(1)}°; ` +
      `closed circuit: ${cc.poles.length} poles, Zout(0) = ${cc.outputImpedance.dcOhm.toPrecision(3)} Ω, ` +
      `stability ${a.stability?.verdict})`,
  );
  console.log('one closed-loop analysis (analyzeDesign), median per call');
  console.log(
    `  the loop gain T(s) alone (analyzeLoop)                    ${perCall(() => analyzeLoop(model), 200)}`,
  );
  console.log(
    `  loop, closed circuit, no time responses or participation  ${perCall(() => analyzeDesign(model, { step: false, participation: false }), 200)}`,
  );
  console.log(
    `  loop, closed circuit and participation, no time responses ${perCall(() => analyzeDesign(model, { step: false }), 200)}`,
  );
  console.log(
    `  full (with the in → out step, settling and the load step) ${perCall(() => analyzeDesign(model), 200)}`,
  );
  console.log(`(machine load average while measuring: ${loadAverage()}; 2 cores shared)`);
}

main();
