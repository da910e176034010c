// Design model → nodal network. Polarity conventions (docs/analysis.md): a non-inverting gm injects
// gm·v(control) into its output node, an inverting one draws it out; G rows are KCL with current leaving.
import type { DesignModel, NodeRef } from '../language/model';
import type { AnalysisProblem } from '../analysis/types';
import { NetworkBuilder, type Network, type NetworkNode, type Terminal } from './network';

export type BuildResult = { ok: true; network: Network } | { ok: false; problems: AnalysisProblem[] };

/**
 * What the network's source is (docs/analysis.md, The loop of a circuit). Every `supply` node and, unless
 * it is the source, the input `in` are held at AC ground.
 * - `input`: the design's input `in` (the default).
 * - `supply`: that supply node is the driven voltage; `in` is grounded.
 * - `current`: a unit current injected into `node` (the source is a current; `in` is grounded).
 * - `break`: the loop opened at the feedback node: every transconductor input that senses `node` senses a
 *   test voltage instead, and the output is `node`. Transconductor inputs draw no current, so every element
 *   stays loaded as in the closed circuit.
 */
export type NetworkSource =
  | { readonly kind: 'input' }
  | { readonly kind: 'supply'; readonly node: string }
  | { readonly kind: 'current'; readonly node: string }
  | { readonly kind: 'break'; readonly node: string };

const INPUT: NetworkSource = { kind: 'input' };

/** Name of the internal node between a nulling resistor and its Miller capacitor (1-based index). */
export const millerMidpointName = (index: number) => `miller${index + 1}.mid`;
/** Name of the internal input node of a current buffer (1-based index). */
export const bufferInputName = (index: number) => `buffer${index + 1}.in`;

export function buildNetwork(model: DesignModel, source: NetworkSource = INPUT): BuildResult {
  const problems: AnalysisProblem[] = [];
  const nodes: NetworkNode[] = [];
  const index = new Map<string, number>();
  const supplies = new Set<string>(model.supplies?.map((s) => s.node));
  const driven = source.kind === 'supply' ? source.node : source.kind === 'input' ? model.input : undefined;
  const grounded = (name: string) => (name === model.input || supplies.has(name)) && name !== driven;
  for (const decl of model.nodes) {
    if (decl.name === model.input || supplies.has(decl.name) || index.has(decl.name)) continue;
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
    if (name === driven) return 'input';
    if (grounded(name)) return 'ground';
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
  const out = terminalOf(source.kind === 'break' ? source.node : model.output, 'the design output');
  const breakAt = source.kind === 'break' ? source.node : undefined;
  let sensesBreak = false;
  /** A sensing input: at the break it senses the test voltage instead of the node. */
  const sensing = (ref: NodeRef, what: string): Terminal | undefined => {
    if (ref.kind === 'node' && ref.name === breakAt) {
      sensesBreak = true;
      return 'input';
    }
    return terminal(ref, what);
  };
  /** gm·(v(p) − v(n)) into `node`; `n` absent is ground. False when an input is not a node. */
  const transconductor = (p: NodeRef, n: NodeRef | undefined, node: Terminal, gm: number, what: string) => {
    const tp = sensing(p, what);
    const tn = n ? sensing(n, what) : 'ground';
    if (tp === undefined || tn === undefined) return false;
    b.transconductance(tp, node, gm);
    b.transconductance(tn, node, -gm);
    return true;
  };
  if (model.output === model.input) {
    problems.push({ message: 'the output is the driven input node', node: model.output });
  }

  for (const st of model.stages) {
    const what = `stage ${st.name}`;
    const node = terminalOf(st.name, what);
    if (node === undefined) continue;
    if (node === 'input') {
      problems.push({ message: `${what} drives the input node`, node: st.name });
      continue;
    }
    // A stage whose input is not a node is reported once, for that alone (a non-finite gm stamps 0).
    const gm = finite(st.gm, `${what}: gm`, st.name) ? st.gm : 0;
    if (!transconductor(st.input, st.inputN, node, st.polarity === 'inverting' ? -gm : gm, what)) continue;
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
      const output = terminal(el.output, what);
      if (output === undefined || !finite(el.value, what)) continue;
      transconductor(
        el.control,
        el.controlN,
        output,
        el.polarity === 'inverting' ? -el.value : el.value,
        what,
      );
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

  if (breakAt !== undefined && !sensesBreak)
    problems.push({
      message: `no stage or transconductance senses the feedback node '${breakAt}', so nothing closes the loop there`,
      node: breakAt,
    });
  if (source.kind === 'current' && typeof index.get(source.node) === 'number') {
    // A unit current into the node: KCL rows hold currents leaving, so the source column is −1 there.
    b.gIn[index.get(source.node)!] -= 1;
    b.gInAbs[index.get(source.node)!] += 1;
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
      inputName: sourceName(source, model.input),
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

/** The source's name where results show it. */
function sourceName(source: NetworkSource, input: string): string {
  switch (source.kind) {
    case 'input':
      return input;
    case 'supply':
      return source.node;
    case 'current':
      return `${source.node} (test current)`;
    case 'break':
      return `${source.node} (test voltage)`;
  }
}
