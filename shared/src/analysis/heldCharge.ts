// Nodes that keep their charge. A node whose every current is capacitive (no conductance, transconductor
// output or source stamp in its KCL row: the summing node of a switched-capacitor stage) obeys
// d/dt (C·v + cIn·vin)ᵢ = 0, so its charge is a constant of the motion: the network has an exact natural
// frequency at s = 0 for each such node that no source can excite (docs/analysis.md, Held charge). In a
// real circuit a reset sets that charge; it is neither a drift nor an instability, and in every transfer
// function its pole at the origin cancels against a zero there.
import type { Network } from '../circuit/network';
import type { Complex } from './types';

/** How many nodes of the network keep their charge (see above). */
export function heldCharges(net: Network): number {
  const { n, G, gIn, C } = net;
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (gIn[i] !== 0) continue;
    let conductive = false;
    let capacitive = false;
    for (let j = 0; j < n; j++) {
      if (G[i * n + j] !== 0) conductive = true;
      if (C[i * n + j] !== 0) capacitive = true;
    }
    if (!conductive && capacitive) count++;
  }
  return count;
}

/** A root this small relative to the largest one is at the origin to working precision. */
const ORIGIN = 1e-9;

const modulus = (r: Complex) => Math.hypot(r.re, r.im);

/**
 * The roots with the `count` smallest ones set to exactly 0 when they lie at the origin to working
 * precision (the eigenvalue solver leaves them a few ulps of the largest root away).
 */
export function snapHeld(roots: readonly Complex[], count: number): Complex[] {
  if (count === 0) return [...roots];
  let largest = 0;
  for (const r of roots) largest = Math.max(largest, modulus(r));
  const order = roots.map((r, i) => i).sort((a, b) => modulus(roots[a]) - modulus(roots[b]));
  const out = [...roots];
  for (const i of order.slice(0, count)) if (modulus(roots[i]) <= ORIGIN * largest) out[i] = { re: 0, im: 0 };
  return out;
}

/**
 * A transfer function's roots with pairs of a pole and a zero at the origin removed: H = N/D with both
 * vanishing at s = 0 is the same function without them (a held charge's mode, or a blocking capacitor
 * in front of an integrator). Roots within ORIGIN of the largest root count as at the origin.
 */
export function cancelAtOrigin(
  poles: readonly Complex[],
  zeros: readonly Complex[],
): { poles: Complex[]; zeros: Complex[] } {
  let largest = 0;
  for (const r of [...poles, ...zeros]) largest = Math.max(largest, modulus(r));
  const atOrigin = (r: Complex) => modulus(r) <= ORIGIN * largest;
  const p = [...poles];
  const z = [...zeros];
  for (;;) {
    const i = p.findIndex(atOrigin);
    const j = z.findIndex(atOrigin);
    if (i < 0 || j < 0) break;
    p.splice(i, 1);
    z.splice(j, 1);
  }
  return { poles: p, zeros: z };
}

/** H(0) = k·Π(−z)/Π(−p) from the pole/zero/gain form (±Infinity with a pole at the origin). */
export function dcFromRoots(k: number, poles: readonly Complex[], zeros: readonly Complex[]): number {
  let re = k;
  let im = 0;
  for (const z of zeros) {
    const nr = -(re * z.re - im * z.im);
    im = -(re * z.im + im * z.re);
    re = nr;
  }
  for (const p of poles) {
    const d = p.re * p.re + p.im * p.im;
    if (d === 0) return Math.sign(re || k) * Infinity;
    // Divide by −p.
    const nr = -(re * p.re + im * p.im) / d;
    im = -(im * p.re - re * p.im) / d;
    re = nr;
  }
  return re;
}
