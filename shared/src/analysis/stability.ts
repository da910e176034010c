// Stability of the closed loop from its own poles. A phase margin read from a Bode plot decides stability
// only when the open loop has no right-half-plane poles (Nyquist criterion; e.g. Franklin, Powell &
// Emami-Naeini, Feedback Control of Dynamic Systems, ch. 6); the closed-loop poles decide it always.
import type { Complex, Stability } from './types';

/**
 * A real part this close to zero is on the imaginary axis to working precision: eigenvalues of the
 * closed-loop state matrix carry an absolute error of about eps·‖A‖, which the largest pole bounds from
 * below, plus a relative error of the pole itself.
 */
function axisTolerance(s: Complex, largest: number): number {
  return 1e-9 * Math.hypot(s.re, s.im) + 1e-12 * largest;
}

export function judgeStability(
  allClosedPoles: readonly Complex[],
  openPoles: readonly Complex[],
  /** Poles exactly at 0 that are held charges (heldCharge.ts): a constant of the motion, not a drift. */
  heldCharges = 0,
): Stability {
  const closedPoles = withoutHeld(allClosedPoles, heldCharges);
  let largest = 0;
  for (const p of closedPoles) largest = Math.max(largest, Math.hypot(p.re, p.im));
  let openLargest = 0;
  for (const p of openPoles) openLargest = Math.max(openLargest, Math.hypot(p.re, p.im));
  const openLoopRhpPoles = openPoles.filter((p) => p.re > axisTolerance(p, openLargest)).length;
  const upper = (p: Complex) => p.im >= 0;
  const rhp = closedPoles.filter((p) => p.re > axisTolerance(p, largest) && upper(p));
  if (rhp.length) return { verdict: 'unstable', poles: rhp, openLoopRhpPoles };
  const onAxis = closedPoles.filter((p) => Math.abs(p.re) <= axisTolerance(p, largest) && upper(p));
  if (onAxis.length) return { verdict: 'marginal', poles: onAxis, openLoopRhpPoles };
  return { verdict: 'stable', openLoopRhpPoles };
}

/** The poles a response can show: the held charges' exact zeros left out (no source excites them). */
export function withoutHeld(poles: readonly Complex[], held: number): Complex[] {
  let skip = held;
  return poles.filter((p) => !(p.re === 0 && p.im === 0 && skip-- > 0));
}

/** An angle in degrees wrapped into (−180°, 180°]: the only range in which a phase margin is meaningful. */
export function wrapDeg(deg: number): number {
  if (!Number.isFinite(deg)) return deg;
  const w = deg - 360 * Math.ceil((deg - 180) / 360);
  return w === -180 ? 180 : w;
}
