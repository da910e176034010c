// The large-signal model of a stage: its output current is bias·tanh(gm·v/bias) instead of gm·v, with v
// its control voltage v(input) − v(inputN). This is the textbook differential-pair large-signal law (the
// tanh form of a bipolar pair's output current; a MOS pair saturates alike at ±its tail current, though
// with a different curve): gm·v for small v, ±bias once the stage saturates. A stage without `bias`
// stays linear.
//
// The network (circuit/buildNetwork.ts) stamps every stage linearly, gm·v. The nonlinearity is applied as a
// correction current on top of it, so the network stays the one source of the linear stamps.
import type { Network } from '../circuit/network';
import type { DesignModel, NodeName, NodeRef } from '../language/model';

/** A control terminal: a network unknown, the driven input, or ground. */
export type ControlTerminal = number | 'input' | 'ground';

export interface SaturatingStage {
  readonly name: NodeName;
  /** Network index of the stage's output node. */
  readonly node: number;
  /** +1 when the stage injects its current into its node (non-inverting), −1 when it draws it out. */
  readonly sign: 1 | -1;
  readonly gm: number;
  readonly bias: number;
  readonly plus: ControlTerminal;
  readonly minus: ControlTerminal;
}

/** The stages of `model` with a positive bias, located in `network`; a stage not in it is left out. */
export function saturatingStages(model: DesignModel, network: Network): SaturatingStage[] {
  const index = new Map<string, number>();
  network.nodes.forEach((node, i) => index.set(node.name, i));
  // A sensed node that is no unknown of the network is held at small-signal ground (a `supply`, or `in`
  // grounded when a supply is the source).
  const terminal = (ref: NodeRef | undefined): ControlTerminal => {
    if (ref === undefined || ref.kind === 'ground') return 'ground';
    if (ref.name === network.inputName) return 'input';
    return index.get(ref.name) ?? 'ground';
  };
  const out: SaturatingStage[] = [];
  for (const st of model.stages) {
    if (st.bias === undefined || !(st.bias > 0) || !(st.gm > 0)) continue;
    const node = index.get(st.name);
    const plus = terminal(st.input);
    const minus = terminal(st.inputN);
    if (node === undefined) continue;
    out.push({
      name: st.name,
      node,
      sign: st.polarity === 'inverting' ? -1 : 1,
      gm: st.gm,
      bias: st.bias,
      plus,
      minus,
    });
  }
  return out;
}

/** The stage's output current over its bias, tanh(gm·v/bias), in (−1, 1). */
export const stageFraction = (s: SaturatingStage, v: number): number => Math.tanh((s.gm * v) / s.bias);
