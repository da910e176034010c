// The panel's view of a design's sweeps: per corner the phase margin, UGF and gain margin at each swept
// value, the requirements on them as lines, the stretches where any requirement fails, and the nominal
// corner's poles and zeros followed along the sweep. Computed from the design as written (the sliders
// move one analysis, not the range), and kept for the design's text so a slider move does not redo it.
import type { CancelToken } from '../analysis/types';
import type { DesignSource, Requirement, RequirementKind } from '../language/model';
import type {
  PanelSweep,
  PanelSweepFailure,
  PanelSweepRequirement,
  SweepQuantity,
} from '../protocol/panelData';
import { requirementFailures, failingRanges } from '../sweep/judgeSweep';
import { locusTracks } from '../sweep/locusTracks';
import { SWEEP_QUANTITY } from '../sweep/quantities';
import { locusOf, metricsOf, specOf, sweepDesign, writeValue, type SweepResult } from '../sweep/sweepDesign';

/**
 * The requirements that bound one of the three quantities drawn, and which. Others (a zero's place, the
 * DC gain, …) still shade the stretches where they fail; they have no line of their own on this chart.
 */
const DRAWN: Partial<Record<RequirementKind, SweepQuantity>> = {
  pm: 'phaseMarginDeg',
  ugf: 'ugfHz',
  'gain-margin': 'gainMarginDb',
};

const drawnQuantity = (req: Requirement) => DRAWN[req.kind];

function requirementLabel(req: Requirement): string {
  const q = drawnQuantity(req);
  const op = 'op' in req ? (req.op === '>=' ? '≥' : '≤') : '≥';
  if (q && 'value' in req) return `${SWEEP_QUANTITY[q].short} ${op} ${SWEEP_QUANTITY[q].text(req.value)}`;
  return `require ${req.kind}`;
}

/** The panel data of one finished sweep. */
export function panelSweep(source: DesignSource, result: SweepResult): PanelSweep {
  const { spec } = result;
  const corners = result.corners.map((corner, c) => {
    const column = (q: SweepQuantity) =>
      result.samples.map((s) => {
        const run = s.runs[c];
        const v = run ? metricsOf(run.analysis)[q] : undefined;
        return v !== undefined && Number.isFinite(v) ? v : null;
      });
    return {
      corner,
      phaseMarginDeg: column('phaseMarginDeg'),
      ugfHz: column('ugfHz'),
      gainMarginDb: column('gainMarginDb'),
    };
  });
  const requirements: PanelSweepRequirement[] = [];
  const failing: PanelSweepFailure[] = [];
  for (const f of requirementFailures(source, result)) {
    const q = drawnQuantity(f.req);
    const label = requirementLabel(f.req);
    if (q && 'value' in f.req && 'op' in f.req)
      requirements.push({ quantity: q, op: f.req.op, value: f.req.value, label });
    for (const r of f.ranges) failing.push({ from: r.from, to: r.to, label });
  }
  const unstable = failingRanges(result, (s) => {
    let any: boolean | undefined;
    for (const run of s.runs) {
      const st = run ? metricsOf(run.analysis).stable : undefined;
      if (st !== undefined) any = (any ?? false) || !st;
    }
    return any;
  });
  for (const r of unstable) failing.push({ from: r.from, to: r.to, label: 'unstable' });
  let worst: PanelSweep['worstPhaseMargin'];
  for (const m of result.minima) {
    const e = m.phaseMarginDeg;
    if (e && (!worst || e.value < worst.value)) worst = e;
  }
  const locus = locusOf(result, 0);
  const track = (kind: 'pole' | 'zero') => (t: ReturnType<typeof locusTracks>[number]) => ({
    kind,
    values: t.map((p) => p.value),
    s: t.map((p) => ({ re: p.s.re, im: p.s.im })),
  });
  return {
    param: spec.param,
    unit: writeValue(1, spec.dimension)?.replace(/^1 ?/, '') ?? '',
    scale: spec.scale,
    values: result.samples.map((s) => s.value),
    corners,
    requirements,
    failing,
    ...(worst ? { worstPhaseMargin: { value: worst.value, at: worst.at, corner: worst.corner } } : {}),
    locus: [
      ...locusTracks(locus, (p) => p.poles).map(track('pole')),
      ...locusTracks(locus, (p) => p.zeros).map(track('zero')),
    ],
  };
}

/** Sweeps of recently shown designs, by the design's text (what they are computed from). */
const MEMO = new Map<string, readonly PanelSweep[]>();
const MEMO_LIMIT = 8;

/**
 * The panel data of every sweep the design states; undefined when it states none or when cancelled
 * part-way (nothing partial is kept).
 */
export function panelSweeps(source: DesignSource, token?: CancelToken): readonly PanelSweep[] | undefined {
  const sweeps = source.nominal?.sweeps ?? [];
  if (sweeps.length === 0) return undefined;
  const hit = MEMO.get(source.text);
  if (hit) return hit;
  const out: PanelSweep[] = [];
  for (const sweep of sweeps) {
    const spec = specOf(source, sweep);
    if (!spec) continue;
    const result = sweepDesign(source, spec, token);
    if (!result.complete || token?.isCancellationRequested) return undefined;
    out.push(panelSweep(source, result));
  }
  if (MEMO.size >= MEMO_LIMIT) MEMO.delete(MEMO.keys().next().value!);
  MEMO.set(source.text, out);
  return out;
}
