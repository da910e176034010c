// Builds valid DesignModel objects in code, with dummy origins, so the engine can be tested on its own.
import type {
  BufferedCap,
  DesignModel,
  Element,
  Load,
  Miller,
  NodeDecl,
  NodeName,
  NodeRef,
  Origin,
  Polarity,
  Requirement,
  Stage,
} from '../../../shared/src/language/model';
import type { Amperes, Farads, Ohms, Ratio, Siemens } from '../../../shared/src/units';

const zero = { line: 0, character: 0 };
export const dummyOrigin: Origin = {
  range: { start: zero, end: zero },
  keywordRange: { start: zero, end: zero },
  insertAt: zero,
  fields: {},
};

export const node = (name: string) => name as NodeName;
export const ref = (name: string): NodeRef =>
  name === 'gnd' ? { kind: 'ground' } : { kind: 'node', name: node(name) };

export interface StageSpec {
  name: string;
  input: string;
  gm: number;
  rout: number;
  cap?: number;
  inverting?: boolean;
  bias?: number;
}
export interface MillerSpec {
  from: string;
  to: string;
  cc: number;
  rz?: number;
}
export interface BufferedSpec {
  from: string;
  to: string;
  cc: number;
  gm: number;
  cap?: number;
}
export type ElementSpec =
  | { kind: 'res' | 'cap'; a: string; b: string; value: number }
  | { kind: 'gm'; control: string; output: string; value: number; inverting?: boolean };

export interface ModelSpec {
  name?: string;
  input?: string;
  output?: string;
  /** Extra declared nodes (stage nodes are declared automatically). */
  nodes?: string[];
  stages: StageSpec[];
  loads?: { node?: string; cap?: number; res?: number }[];
  millers?: MillerSpec[];
  buffered?: BufferedSpec[];
  elements?: ElementSpec[];
  beta?: number;
  requirements?: Requirement[];
}

export function buildModel(spec: ModelSpec): DesignModel {
  const input = spec.input ?? 'in';
  const output = spec.output ?? spec.stages[spec.stages.length - 1]?.name ?? 'out';
  const decls: NodeDecl[] = [{ name: node(input), kind: 'input' }];
  const seen = new Set([input]);
  for (const st of spec.stages) {
    if (!seen.has(st.name)) decls.push({ name: node(st.name), kind: 'stage' });
    seen.add(st.name);
  }
  for (const n of [...(spec.nodes ?? []), output]) {
    if (!seen.has(n)) decls.push({ name: node(n), kind: n === 'out' ? 'output' : 'declared' });
    seen.add(n);
  }
  const pol = (inv?: boolean): Polarity => (inv ? 'inverting' : 'noninverting');
  const stages: Stage[] = spec.stages.map((s) => ({
    name: node(s.name),
    input: ref(s.input),
    gm: s.gm as Siemens,
    rout: s.rout as Ohms,
    cap: (s.cap ?? 0) as Farads,
    polarity: pol(s.inverting),
    ...(s.bias !== undefined ? { bias: s.bias as Amperes } : {}),
    origin: dummyOrigin,
  }));
  const loads: Load[] = (spec.loads ?? []).map((l) => ({
    node: node(l.node ?? output),
    ...(l.cap !== undefined ? { cap: l.cap as Farads } : {}),
    ...(l.res !== undefined ? { res: l.res as Ohms } : {}),
    origin: dummyOrigin,
  }));
  const millers: Miller[] = (spec.millers ?? []).map((m) => ({
    from: node(m.from),
    to: node(m.to),
    cc: m.cc as Farads,
    ...(m.rz !== undefined ? { rz: m.rz as Ohms } : {}),
    origin: dummyOrigin,
  }));
  const buffered: BufferedCap[] = (spec.buffered ?? []).map((b) => ({
    from: node(b.from),
    to: node(b.to),
    cc: b.cc as Farads,
    gm: b.gm as Siemens,
    ...(b.cap !== undefined ? { cap: b.cap as Farads } : {}),
    origin: dummyOrigin,
  }));
  const elements: Element[] = (spec.elements ?? []).map((e): Element => {
    if (e.kind === 'gm') {
      return {
        kind: 'gm',
        control: ref(e.control),
        output: ref(e.output),
        value: e.value as Siemens,
        polarity: pol(e.inverting),
        origin: dummyOrigin,
      };
    }
    if (e.kind === 'res')
      return { kind: 'res', a: ref(e.a), b: ref(e.b), value: e.value as Ohms, origin: dummyOrigin };
    return { kind: 'cap', a: ref(e.a), b: ref(e.b), value: e.value as Farads, origin: dummyOrigin };
  });
  return {
    name: spec.name ?? 'test',
    nodes: decls,
    input: node(input),
    output: node(output),
    stages,
    loads,
    millers,
    buffered,
    elements,
    feedback: { kind: 'factor', beta: (spec.beta ?? 1) as Ratio },
    requirements: spec.requirements ?? [],
    params: [],
  };
}

/** The classic two-stage Miller amplifier: stage a (non-inverting) then inverting stage b at the output. */
export interface TwoStage {
  gm1: number;
  r1: number;
  c1: number;
  gm2: number;
  r2: number;
  c2: number;
  cc: number;
  rz?: number;
  beta?: number;
}

export function twoStage(p: TwoStage): DesignModel {
  return buildModel({
    stages: [
      { name: 'a', input: 'in', gm: p.gm1, rout: p.r1, cap: p.c1 },
      { name: 'b', input: 'a', gm: p.gm2, rout: p.r2, cap: p.c2, inverting: true },
    ],
    millers: p.cc > 0 || p.rz !== undefined ? [{ from: 'a', to: 'b', cc: p.cc, rz: p.rz }] : [],
    beta: p.beta,
  });
}

/** Real roots of a·s² + b·s + c (a ≠ 0), or the complex pair, sorted by magnitude. */
export function quadraticRoots(a: number, b: number, c: number): { re: number; im: number }[] {
  const disc = b * b - 4 * a * c;
  if (disc >= 0) {
    const q = -0.5 * (b + Math.sign(b || 1) * Math.sqrt(disc));
    const r = [q / a, c / q].sort((x, y) => Math.abs(x) - Math.abs(y));
    return r.map((re) => ({ re, im: 0 }));
  }
  const re = -b / (2 * a);
  const im = Math.sqrt(-disc) / (2 * a);
  return [
    { re, im },
    { re, im: -im },
  ];
}

export const relErr = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

/** A chain of one-pole sections: gm_i into R_i ∥ C_i, each driven by the previous node. */
export function chain(sections: { gm: number; r: number; c: number; inverting?: boolean }[], beta = 1) {
  return buildModel({
    stages: sections.map((s, i) => ({
      name: `s${i + 1}`,
      input: i === 0 ? 'in' : `s${i}`,
      gm: s.gm,
      rout: s.r,
      cap: s.c,
      inverting: s.inverting,
    })),
    beta,
  });
}

/** Each computed root matched to the nearest unused reference root; the worst distance relative to its size. */
export function worstMatch(
  ours: readonly { re: number; im: number }[],
  ref: readonly { re: number; im: number }[],
): number {
  const left = [...ref];
  let worst = 0;
  for (const p of ours) {
    let bi = 0;
    let bd = Infinity;
    left.forEach((q, i) => {
      const d = Math.hypot(p.re - q.re, p.im - q.im);
      if (d < bd) {
        bd = d;
        bi = i;
      }
    });
    const q = left.splice(bi, 1)[0]!;
    worst = Math.max(worst, bd / Math.hypot(q.re, q.im));
  }
  return worst;
}
