// Closed forms for the hand-checked fixture test/editor/fixtures/twoStageClosedForm.ampnote: a two-stage
// amplifier with a plain Miller capacitor and no other element, so its poles and zero are known exactly.

/** The fixture's values as written there (SI). The suite checks the file still says so. */
export const FIXTURE = {
  file: 'hand-checked/twoStageClosedForm.ampnote',
  gm1: 200e-6,
  r1: 1e6,
  c1: 100e-15,
  gm2: 1e-3,
  r2: 100e3,
  /** Stage node capacitance 200 fF plus the 2 pF load at the output. */
  c2: 200e-15 + 2e-12,
  cc: 1e-12,
  /** The lines as written, so a change to the fixture cannot leave these numbers stale. */
  text: [
    'stage first   gm = 200 uS  rout = 1 Mohm    cap = 100 fF',
    'stage second  gm = 1 mS    rout = 100 kohm  cap = 200 fF  inverting',
    'load cap = 2 pF',
    'miller first -> second  cc = 1 pF',
  ],
} as const;

/**
 * Poles of the two-stage Miller network: roots of
 *   D(s) = 1 + s·[(C1 + Cc)·R1 + (C2 + Cc)·R2 + gm2·R1·R2·Cc] + s²·R1·R2·(C1·C2 + Cc·(C1 + C2)),
 * the nodal determinant of the two-node model (two-stage Miller denominator, Gray/Hurst/Lewis/Meyer
 * ch. 9, from memory, re-derived from the nodal equations). Returned as |s|/2π in Hz, lowest first.
 */
export function twoStagePolesHz(v: typeof FIXTURE): [number, number] {
  const b1 = (v.c1 + v.cc) * v.r1 + (v.c2 + v.cc) * v.r2 + v.gm2 * v.r1 * v.r2 * v.cc;
  const b2 = v.r1 * v.r2 * (v.c1 * v.c2 + v.cc * (v.c1 + v.c2));
  const disc = b1 * b1 - 4 * b2;
  if (disc < 0) throw new Error('the fixture was meant to have real poles');
  // s = (−b1 ± √disc) / (2·b2); the small root written as 2/(−b1 − √disc) to avoid cancellation.
  const small = Math.abs(2 / (-b1 - Math.sqrt(disc)));
  const large = Math.abs((-b1 - Math.sqrt(disc)) / (2 * b2));
  return [small / (2 * Math.PI), large / (2 * Math.PI)];
}

/** The right-half-plane zero of the plain Miller capacitor: s = +gm2/Cc (same source). */
export function rhpZeroHz(v: typeof FIXTURE): number {
  return v.gm2 / v.cc / (2 * Math.PI);
}
