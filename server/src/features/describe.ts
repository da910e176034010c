// Text about analyzed elements shared by hover, inlay hints and code lens: poles a node takes part in,
// zeros, requirement measurements across corners.
import type { DesignAnalysis, Pole, Zero } from '../../../shared/src/analysis/types';
import { measure, type Measurement } from '../../../shared/src/checks/measure';
import { formatHz } from '../../../shared/src/format/si';
import { fixedNumber } from '../../../shared/src/format/special';
import { modulus } from '../../../shared/src/numeric/complex';
import type { Requirement } from '../../../shared/src/language/model';
import type { CornerRun, DesignReport } from '../../../shared/src/report';

export const sortedByHz = <T extends { hz: number }>(xs: readonly T[]): T[] =>
  [...xs].sort((a, b) => a.hz - b.hz);

const isComplex = (p: Pole) => Math.abs(p.s.im) > 1e-9 * modulus(p.s);

/** A complex pair is shown once: its upper member stands for both. */
export const shownPoles = (poles: readonly Pole[]): Pole[] =>
  sortedByHz(poles.filter((p) => !isComplex(p) || p.s.im > 0));

export function poleText(p: Pole): string {
  const unstable = p.s.re > 0;
  return `${formatHz(p.hz)}${isComplex(p) ? ` (pair, ζ = ${fixedNumber(p.damping, 2)})` : ''}${unstable ? ' (unstable)' : ''}`;
}

export function zeroText(z: Zero): string {
  if (!Number.isFinite(z.hz)) return '∞';
  return `${formatHz(z.hz)} ${z.rhp ? 'RHP' : 'LHP'}`;
}

/** Poles in which `nodes` take part (≥ 1 %), with each node's share. */
export function polesOf(
  analysis: DesignAnalysis,
  nodes: readonly string[],
): { pole: Pole; shares: string }[] {
  const out: { pole: Pole; shares: string }[] = [];
  for (const pole of shownPoles(analysis.poles)) {
    const mine = pole.participation.filter((x) => nodes.includes(x.node) && x.share >= 0.01);
    if (!mine.length) continue;
    const others = pole.participation.filter((x) => !nodes.includes(x.node) && x.share >= 0.01);
    const parts = [...mine, ...others].map((x) => `${x.node} ${Math.round(x.share * 100)} %`).join(', ');
    out.push({ pole, shares: parts });
  }
  return out;
}

export function nominal(design: DesignReport): CornerRun | undefined {
  return design.runs.find((r) => r.corner === 'nominal' && !r.analysis.problems.length);
}

export interface RequirementAcrossRuns {
  readonly nominal?: Measurement;
  readonly runs: readonly { corner: string; m: Measurement }[];
  /** The failing run, or the one closest to the limit. */
  readonly worst?: { corner: string; m: Measurement };
}

export function requirementAcrossRuns(design: DesignReport, req: Requirement): RequirementAcrossRuns {
  const runs = design.runs
    .filter((r) => !r.analysis.problems.length)
    .map((r) => {
      // The same statement in this run's model (a design may state two of a kind: `settle` with and
      // without `step`); corners keep the statement's range.
      const at = req.origin.range.start;
      const same =
        r.model.requirements.find(
          (x) =>
            x.kind === req.kind &&
            x.origin.range.start.line === at.line &&
            x.origin.range.start.character === at.character,
        ) ??
        r.model.requirements.find((x) => x.kind === req.kind) ??
        req;
      return { corner: r.corner, m: measure(same, r.analysis) };
    });
  const lowerIsWorse = !(req.kind === 'settle' || ('op' in req && req.op === '<='));
  let worst = runs.find((r) => !r.m.pass);
  if (!worst) {
    for (const r of runs) {
      if (r.m.value === undefined) continue;
      if (
        !worst ||
        worst.m.value === undefined ||
        (lowerIsWorse ? r.m.value < worst.m.value : r.m.value > worst.m.value)
      )
        worst = r;
    }
  }
  const nom = runs.find((r) => r.corner === 'nominal')?.m;
  return { ...(nom ? { nominal: nom } : {}), runs, ...(worst ? { worst } : {}) };
}
