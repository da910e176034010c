// Design model → nodal network. Polarity conventions (docs/analysis.md): a non-inverting gm injects
// gm·v(control) into its output node, an inverting one draws it out; G rows are KCL with current leaving.
import type { DesignModel, NodeRef } from '../language/model';
import type { AnalysisProblem } from '../analysis/types';
import { NetworkBuilder, type Network, type NetworkNode, type Terminal } from './network';

export type BuildResult = { ok: true; network: Network } | { ok: false; problems: AnalysisProblem[] };

/** Name of the internal node between a nulling resistor and its Miller capacitor (1-based index). */
export const millerMidpointName = (index: number) => `miller${index + 1}.mid`;
/** Name of the internal input node of a current buffer (1-based index). */
export const bufferInputName = (index: number) => `buffer${index + 1}.in`;

export function buildNetwork(model: DesignModel): BuildResult {
  const problems: AnalysisProblem[] = [];
  const nodes: NetworkNode[] = [];
  const index = new Map<string, number>();
  for (const decl of model.nodes) {
    if (decl.name === model.input || index.has(decl.name)) continue;
    index.set(decl.name, nodes.length);
    nodes.push({ name: decl.name, kind: 'design' });
  }
  const internal = (name: string, label: string): number => {
    index.set(name, nodes.length);
    nodes.push({ name, kind: 'internal', label });
    return nodes.length - 1;
  };
  model.millers.forEach((m, i) => {
    if (m.rz !== undefined && m.rz > 0)
      internal(millerMidpointName(i), `miller ${m.from} -> ${m.to} (Rz–Cc junction)`);
  });
  model.buffered.forEach((bc, i) =>
    internal(bufferInputName(i), `indirect ${bc.from} -> ${bc.to} (buffer input)`),
  );

  const terminalOf = (name: string, what: string): Terminal | undefined => {
    if (name === model.input) return 'input';
    const i = index.get(name);
    if (i === undefined)
      problems.push({ message: `${what} refers to node '${name}', which is not declared`, node: name });
    return i;
  };
  const terminal = (ref: NodeRef, what: string): Terminal | undefined =>
    ref.kind === 'ground' ? 'ground' : terminalOf(ref.name, what);
  const finite = (value: number | undefined, what: string, node?: string): boolean => {
    if (value === undefined) return true;
    if (Number.isFinite(value)) return true;
    problems.push({ message: `${what} is not a finite number (${value})`, node });
    return false;
  };
  const resistance = (value: number, what: string, node?: string): number | undefined => {
    if (!finite(value, what, node)) return undefined;
    if (value === 0) {
      problems.push({
        message: `${what} is zero: a short circuit cannot be modelled as a conductance`,
        node,
      });
      return undefined;
    }
    return 1 / value;
  };

  const b = new NetworkBuilder(nodes.length);
  const out = terminalOf(model.output, 'the design output');
  if (model.output === model.input) {
    problems.push({ message: 'the output is the driven input node', node: model.output });
  }

  for (const st of model.stages) {
    const what = `stage ${st.name}`;
    const node = terminalOf(st.name, what);
    const input = terminal(st.input, what);
    if (node === undefined || input === undefined) continue;
    if (node === 'input') {
      problems.push({ message: `${what} drives the input node`, node: st.name });
      continue;
    }
    if (finite(st.gm, `${what}: gm`, st.name)) {
      b.transconductance(input, node, st.polarity === 'inverting' ? -st.gm : st.gm);
    }
    const g = resistance(st.rout, `${what}: rout`, st.name);
    if (g !== undefined) b.conductance(node, 'ground', g);
    if (finite(st.cap, `${what}: cap`, st.name)) b.capacitance(node, 'ground', st.cap);
  }

  for (const load of model.loads) {
    const node = terminalOf(load.node, 'load');
    if (node === undefined) continue;
    if (load.cap !== undefined && finite(load.cap, 'load cap', load.node))
      b.capacitance(node, 'ground', load.cap);
    if (load.res !== undefined) {
      const g = resistance(load.res, 'load res', load.node);
      if (g !== undefined) b.conductance(node, 'ground', g);
    }
  }

  model.millers.forEach((m, i) => {
    const what = `miller ${m.from} -> ${m.to}`;
    const from = terminalOf(m.from, what);
    const to = terminalOf(m.to, what);
    if (from === undefined || to === undefined || !finite(m.cc, `${what}: cc`, m.from)) return;
    if (m.rz !== undefined && m.rz > 0) {
      const mid = index.get(millerMidpointName(i))!;
      const g = resistance(m.rz, `${what}: rz`, m.from);
      if (g !== undefined) b.conductance(from, mid, g);
      if (g !== undefined && typeof from === 'number') nodes[mid] = { ...nodes[mid], seriesTo: from };
      b.capacitance(mid, to, m.cc);
    } else {
      if (m.rz !== undefined && !finite(m.rz, `${what}: rz`, m.from)) return;
      b.capacitance(from, to, m.cc);
    }
  });

  model.buffered.forEach((bc, i) => {
    const what = `buffered ${bc.from} -> ${bc.to}`;
    const from = terminalOf(bc.from, what);
    const to = terminalOf(bc.to, what);
    if (from === undefined || to === undefined) return;
    if (!finite(bc.cc, `${what}: cc`, bc.from) || !finite(bc.gm, `${what}: gm`, bc.from)) return;
    if (!finite(bc.cap, `${what}: cap`, bc.from)) return;
    const x = index.get(bufferInputName(i))!;
    if (typeof to === 'number') nodes[x] = { ...nodes[x], currentTo: to };
    // Common-gate buffer: its input (source) node x sees 1/gm to small-signal ground, and the device
    // current gm·v(x) that leaves x is delivered into `to`, so the capacitor current is passed on.
    b.capacitance(from, x, bc.cc);
    b.conductance(x, 'ground', bc.gm);
    if (bc.cap !== undefined) b.capacitance(x, 'ground', bc.cap);
    b.transconductance(x, to, bc.gm);
  });

  for (const el of model.elements) {
    if (el.kind === 'gm') {
      const what = 'element gm';
      const control = terminal(el.control, what);
      const output = terminal(el.output, what);
      if (control === undefined || output === undefined || !finite(el.value, what)) continue;
      b.transconductance(control, output, el.polarity === 'inverting' ? -el.value : el.value);
      continue;
    }
    const what = `element ${el.kind}`;
    const a = terminal(el.a, what);
    const c = terminal(el.b, what);
    if (a === undefined || c === undefined) continue;
    if (el.kind === 'res') {
      const g = resistance(el.value, what);
      if (g !== undefined) b.conductance(a, c, g);
    } else if (finite(el.value, what)) {
      b.capacitance(a, c, el.value);
    }
  }

  if (problems.length > 0 || typeof out !== 'number') {
    if (problems.length === 0)
      problems.push({ message: 'the design has no output node', node: model.output });
    return { ok: false, problems };
  }
  return {
    ok: true,
    network: {
      n: nodes.length,
      nodes,
      G: b.G,
      C: b.C,
      gIn: b.gIn,
      cIn: b.cIn,
      output: out,
      inputName: model.input,
      capRank: b.capRank(),
      gAbs: absolute(b.gAbs),
      gInAbs: absolute(b.gInAbs),
    },
  };
}

/** Entry-wise magnitudes in place (the builder's off-diagonal sums carry the stamp's sign). */
function absolute(a: Float64Array): Float64Array {
  for (let i = 0; i < a.length; i++) a[i] = Math.abs(a[i]);
  return a;
}
