// How the participation of a pole is shown. The raw shares are per network node, internal ones included;
// users wrote only the design nodes, so an internal node is shown under a label tied to its statement,
// and a nulling resistor's junction is counted with the node it hangs from when the resistor carries
// little of the mode's voltage (the junction then moves with that node: it is part of it at this pole).
import type { Network } from '../circuit/network';
import type { Participation } from './types';

/**
 * A junction joins its node when |φ_junction − φ_node| ≤ this × |φ_node|: the drop across the series
 * resistor is small against the node's own swing, i.e. Rz is small against the node's impedance at the
 * pole (the drop over the swing is about Rz/|Z_node(s)|). A buffer input joins the node it feeds when
 * |ψ_input − ψ_node| ≤ this × |ψ_node|: the buffer passes on at least about 90 % of a current injected at
 * its input at that frequency (its 1/gm is small against the other paths from the input).
 */
export const JOIN_BELOW = 0.1;

/** A pole is named after a node holding at least this share. */
export const NAME_SHARE = 0.8;

export interface ShownParticipation {
  readonly participation: Participation[];
  /** Per network node under its network name, sorted; only when the network has internal nodes. */
  readonly raw?: Participation[];
  readonly namedAfter: string;
}

const bySize = (a: Participation, b: Participation) => b.share - a.share;

/**
 * `shares[i]` = |p_i| (not normalised), `phiRe/phiIm` the right null vector (unscaled), both per network
 * node. Shares are normalised to sum to 1 before and after attribution.
 */
export function showParticipation(
  net: Network,
  shares: Float64Array,
  phiRe: Float64Array,
  phiIm: Float64Array,
  psiRe: Float64Array,
  psiIm: Float64Array,
): ShownParticipation {
  const { n, nodes } = net;
  let total = 0;
  for (let i = 0; i < n; i++) total += shares[i];
  const norm = total > 0 ? 1 / total : 0;
  let internal = false;
  for (let i = 0; i < n; i++) if (nodes[i].kind === 'internal') internal = true;
  if (!internal) {
    const participation = nodes.map((node, i) => ({ node: node.name, share: shares[i] * norm }));
    participation.sort(bySize);
    return { participation, namedAfter: nameOf(participation, net) };
  }
  const raw = nodes.map((node, i) => ({ node: node.name, share: shares[i] * norm }));
  const shown = Float64Array.from(shares, (x) => x * norm);
  const joined = new Uint8Array(n);
  // Two vectors from one factorisation, each to within its own scale: compare entries of one vector only.
  const close = (re: Float64Array, im: Float64Array, k: number, j: number) => {
    const dr = re[k] - re[j];
    const di = im[k] - im[j];
    const size2 = re[j] * re[j] + im[j] * im[j];
    return size2 > 0 && dr * dr + di * di <= JOIN_BELOW * JOIN_BELOW * size2;
  };
  for (let k = 0; k < n; k++) {
    const series = nodes[k].seriesTo;
    const follower = nodes[k].currentTo;
    // A junction whose voltage follows its node (right vector), or a buffer input where an injected
    // current acts as it would at the node the buffer feeds (left vector).
    const j =
      series !== undefined && close(phiRe, phiIm, k, series)
        ? series
        : follower !== undefined && close(psiRe, psiIm, k, follower)
          ? follower
          : undefined;
    if (j === undefined) continue;
    shown[j] += shown[k];
    joined[k] = 1;
  }
  const participation: Participation[] = [];
  for (let i = 0; i < n; i++) {
    if (joined[i]) continue;
    participation.push({ node: nodes[i].label ?? nodes[i].name, share: shown[i] });
  }
  participation.sort(bySize);
  raw.sort(bySize);
  return { participation, raw, namedAfter: nameOf(participation, net) };
}

/** The design node holding ≥ 80 % of the pole, else `shared` (an internal node never names a pole). */
function nameOf(participation: readonly Participation[], net: Network): string {
  const top = participation[0];
  if (!top || !(top.share >= NAME_SHARE)) return 'shared';
  const node = net.nodes.find((x) => (x.label ?? x.name) === top.node);
  return node && node.kind === 'design' ? top.node : 'shared';
}
