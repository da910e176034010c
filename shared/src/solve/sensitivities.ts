// How much each parameter moves the loop: the change of phase margin, UGF, gain margin and DC gain for a
// +10 % change of the parameter, in every corner. Exact finite differences: the parameter's literal is
// rewritten in the text and the design analysed again, so a parameter used in several places (and every
// value derived from it) moves together. A +10 % step is what a designer means by "a bit more": the
// figure is a difference, not a derivative, and says so.
import { analyzeDesign } from '../analysis/analyzeDesign';
import type { CheckEngine } from '../checks/context';
import { rerunEdited } from '../checks/fixes';
import { knobsOf } from '../checks/knobs';
import type { DesignSource } from '../language/model';
import type { CornerRun } from '../report';
import { gainDb } from '../units';

export const SENSITIVITY_STEP = 0.1;

export interface Sensitivity {
  readonly param: string;
  readonly corner: string;
  /** Changes for a +10 % step of the parameter (undefined where the quantity is undefined before or after). */
  readonly phaseMarginDeg?: number;
  /** Relative change of the UGF (0.05 = +5 %). */
  readonly ugfRelative?: number;
  readonly gainMarginDb?: number;
  readonly dcGainDb?: number;
}

const ENGINE: CheckEngine = {
  analyze: (m) => analyzeDesign(m, { step: false, participation: false }),
  solveRzForZeroAtInfinity: () => ({ ok: false, reason: 'not used' }),
  solveRzToCancelPole: () => ({ ok: false, reason: 'not used' }),
};

/** Sensitivities of every parameter written as a literal (or only `only`), in every run of `runs`. */
export function sensitivities(
  source: DesignSource,
  runs: readonly CornerRun[],
  only?: string,
): Sensitivity[] {
  const nominal = source.nominal;
  if (!nominal) return [];
  const out: Sensitivity[] = [];
  for (const param of nominal.params) {
    if (only !== undefined && param.name !== only) continue;
    const value = param.origin.fields['value'];
    const knob = value && knobsOf(nominal, { ...value, param: param.name }, param.name)[0];
    if (!knob || knob.derived || knob.value === 0) continue;
    const after = rerunEdited(
      source,
      [{ range: knob.range, newText: knob.write(knob.value * (1 + SENSITIVITY_STEP)) }],
      ENGINE,
    );
    if (!after) continue;
    for (const run of runs) {
      const moved = after.find((r) => r.corner === run.corner);
      if (!moved) continue;
      const a = run.analysis.loop;
      const b = moved.analysis.loop;
      const diff = (x?: number, y?: number) =>
        x !== undefined && y !== undefined && Number.isFinite(x) && Number.isFinite(y) ? y - x : undefined;
      const dc0 = gainDb(run.analysis.dcGain);
      const dc1 = gainDb(moved.analysis.dcGain);
      const ugf = a.ugfHz !== undefined && b.ugfHz !== undefined ? b.ugfHz / a.ugfHz - 1 : undefined;
      out.push({
        param: param.name,
        corner: run.corner,
        ...defined('phaseMarginDeg', diff(a.phaseMarginDeg, b.phaseMarginDeg)),
        ...defined('ugfRelative', ugf),
        ...defined('gainMarginDb', diff(a.gainMarginDb, b.gainMarginDb)),
        ...defined('dcGainDb', diff(dc0, dc1)),
      });
    }
  }
  return out;
}

const defined = <K extends string>(key: K, v: number | undefined) =>
  (v === undefined ? {} : { [key]: v }) as Partial<Record<K, number>>;

/** One line per run for people: `nominal: phase margin +1.2°, UGF +4.5 %, gain margin −0.3 dB, DC gain +0.8 dB`. */
export function sensitivityText(x: Sensitivity): string {
  const signed = (v: number, digits: number, unit: string) =>
    `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(digits)}${unit}`;
  const parts = [
    x.phaseMarginDeg !== undefined ? `phase margin ${signed(x.phaseMarginDeg, 1, '°')}` : undefined,
    x.ugfRelative !== undefined ? `UGF ${signed(100 * x.ugfRelative, 1, ' %')}` : undefined,
    x.gainMarginDb !== undefined ? `gain margin ${signed(x.gainMarginDb, 1, ' dB')}` : undefined,
    x.dcGainDb !== undefined ? `DC gain ${signed(x.dcGainDb, 1, ' dB')}` : undefined,
  ].filter((t): t is string => t !== undefined);
  return `${x.corner}: ${parts.length ? parts.join(', ') : 'no loop quantity to compare'}`;
}
