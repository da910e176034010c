// Stability from the closed loop itself: any closed-loop pole in the right half-plane is an error, whatever
// the margins read. When the open loop has right-half-plane poles of its own, margins read from a Bode
// plot do not decide stability (Nyquist criterion), and the finding says so.
import type { Pole } from '../analysis/types';
import { formatHz, formatSi } from '../format/si';
import { formatRootHz } from '../format/root';
import { feedbackNode, type DesignModel, type Origin } from '../language/model';
import type { CornerRun } from '../report';
import { splitLines } from '../text/lines';
import { acrossRuns, type Hit } from './acrossRuns';
import type { Check, CheckInput } from './context';
import { rerunEdited } from './fixes';
import { compensationRange, judgedAsLoop, participationText, primaryCompensation } from './locate';
import type { FixSuggestion, TextEditSpec } from './types';

export const stabilityCheck: Check = (input: CheckInput) =>
  acrossRuns(
    input,
    'stability',
    (run): Hit[] => {
      const stability = run.analysis.stability;
      if (!stability || !judgedAsLoop(run.model)) return [];
      const positive = positiveFeedback(run);
      if (positive) return [positive];
      const range = compensationRange(input.source, primaryCompensation(run.model), run);
      const rhpOpen = run.analysis.poles.filter((p) => p.s.re > 0);
      const related = openLoopCulprits(run.model, rhpOpen);
      const openNote = openLoopNote(stability.openLoopRhpPoles);
      switch (stability.verdict) {
        case 'stable':
          if (stability.openLoopRhpPoles === 0) return [];
          return [
            {
              key: 'open-rhp',
              severity: 'warning',
              message:
                `Every closed-loop pole lies in the left half-plane, but ${openNote}: the loop is only ` +
                'conditionally stable, and a lower loop gain (a weaker corner, a smaller feedback factor) can make it oscillate',
              range,
              related,
              badness: stability.openLoopRhpPoles,
            },
          ];
        case 'unstable': {
          const worst = [...stability.poles].sort((a, b) => b.re - a.re)[0]!;
          const behaviour =
            worst.im !== 0
              ? `it oscillates, growing, near ${formatHz(Math.abs(worst.im) / (2 * Math.PI))}`
              : 'its output runs away without oscillating (it latches)';
          return [
            {
              key: 'unstable',
              severity: 'error',
              message:
                `The closed loop is unstable: closed-loop pole${stability.poles.length > 1 ? 's' : ''} at ` +
                `${stability.poles.map(formatRootHz).join(', ')} lie${stability.poles.length > 1 ? '' : 's'} in the right half-plane, so ${behaviour}, whatever the margins read` +
                (stability.openLoopRhpPoles ? `. ${capitalise(openNote)}` : ''),
              range,
              related,
              badness: worst.re,
            },
          ];
        }
        case 'marginal': {
          const oscillating = stability.poles.find((p) => p.im !== 0);
          return [
            oscillating
              ? {
                  key: 'marginal',
                  severity: 'error',
                  message:
                    `The closed loop has poles on the imaginary axis (${formatRootHz(oscillating)}): it ` +
                    `sustains an oscillation at ${formatHz(Math.abs(oscillating.im) / (2 * Math.PI))}`,
                  range,
                  related,
                  badness: 1,
                }
              : {
                  key: 'marginal',
                  severity: 'warning',
                  message:
                    'The closed loop has a pole at the origin: nothing holds its output at DC, so it drifts',
                  range,
                  related,
                  badness: 0,
                },
          ];
        }
        default: {
          const never: never = stability;
          return never;
        }
      }
    },
    ({ worst, worstRun }) => (worst.key === 'open-rhp' ? [] : polarityFixes(input, worstRun)),
  );

/**
 * A loop closed by the circuit whose return ratio is negative at DC feeds back positively: a polarity slip
 * (a stage's sense, or the side of a differential input that senses the feedback node). The analysis never
 * normalises that sign away, so it is named here whatever the closed-loop poles do.
 */
function positiveFeedback(run: CornerRun): Hit | undefined {
  const at = feedbackNode(run.model);
  const t0 = run.analysis.dcGain;
  if (!at || !(t0 < 0)) return undefined;
  // The signed value: a magnitude in dB would hide the sign that is the point.
  const size = Number.isFinite(t0) ? `T(0) = ${formatSi(t0, 'V/V')}` : 'an integrator in the loop';
  return {
    key: 'positive-feedback',
    severity: 'error',
    message:
      `The loop closed at ${at.node} feeds back positively at DC (${size}): check the polarity of the stages ` +
      `in the loop, and which side of a differential input senses ${at.node}`,
    range: at.origin.keywordRange,
    related: [],
    badness: Number.isFinite(t0) ? Math.abs(t0) : Number.MAX_VALUE,
  };
}

function openLoopNote(count: number): string {
  return (
    `the open loop itself has ${count} right-half-plane pole${count > 1 ? 's' : ''} (a local loop with ` +
    'positive feedback: check the polarity of the stages it involves), and margins read from a Bode plot ' +
    'do not decide stability when the open loop has them'
  );
}

const capitalise = (text: string) => text.charAt(0).toUpperCase() + text.slice(1);

/** The stages that take part in the open loop's right-half-plane poles, as related information. */
function openLoopCulprits(model: DesignModel, rhpOpen: readonly Pole[]) {
  const out: { range: Origin['range']; message: string }[] = [];
  const seen = new Set<string>();
  for (const p of rhpOpen) {
    if (p.s.im < 0) continue;
    for (const share of p.participation) {
      if (share.share < 0.2 || seen.has(share.node)) continue;
      const stage = model.stages.find((s) => s.name === share.node);
      if (!stage) continue;
      seen.add(share.node);
      out.push({
        range: stage.origin.keywordRange,
        message:
          `stage ${stage.name} (${stage.polarity}) takes part in the open loop's right-half-plane pole at ` +
          `${formatRootHz(p.s)} (${participationText(p.participation)})`,
      });
    }
  }
  return out;
}

/**
 * A polarity slip is the usual cause of a loop whose open loop has right-half-plane poles: offer to flip
 * each stage's polarity when that makes the closed loop stable in every corner. The analysis normalises the
 * sign of the DC loop gain to negative feedback, so a flip changes only the local loops.
 */
function polarityFixes(input: CheckInput, worstRun: CornerRun): FixSuggestion[] {
  const engine = input.engine;
  const nominal = input.source.nominal;
  const positive = positiveFeedback(worstRun) !== undefined;
  if (!engine || !nominal || !(worstRun.analysis.stability?.openLoopRhpPoles || positive)) return [];
  // A flip must leave every corner stable and, for a loop written as a circuit, negative feedback at DC.
  const fixed = (r: CornerRun) =>
    r.analysis.stability?.verdict === 'stable' &&
    (r.model.feedback.kind === 'factor' || r.analysis.dcGain > 0);
  const fixes: FixSuggestion[] = [];
  for (const stage of nominal.stages) {
    const flipped = stage.polarity === 'inverting' ? 'noninverting' : 'inverting';
    const edit = polarityEdit(input.source.text, input.source.range.start.line, stage.origin, flipped);
    if (!edit) continue;
    const runs = rerunEdited(input.source, [edit], engine);
    if (!runs || !runs.every(fixed)) continue;
    fixes.push({
      title: `Make stage ${stage.name} ${flipped} (the closed loop is then stable in every corner)`,
      edits: [edit],
      ...(fixes.length === 0 ? { preferred: true } : {}),
    });
  }
  return fixes;
}

/** Replace the stage's written polarity word, or append the new one at the statement's end. */
function polarityEdit(
  text: string,
  firstLine: number,
  origin: Origin,
  polarity: 'inverting' | 'noninverting',
): TextEditSpec | undefined {
  const line = splitLines(text).lines[origin.range.start.line - firstLine];
  if (line === undefined) return undefined;
  const from = origin.range.start.character;
  const to = origin.insertAt.line === origin.range.start.line ? origin.insertAt.character : line.length;
  const match = /\b(noninverting|inverting)\b/.exec(line.slice(from, to));
  if (match) {
    const at = from + match.index;
    const l = origin.range.start.line;
    return {
      range: { start: { line: l, character: at }, end: { line: l, character: at + match[0].length } },
      newText: polarity,
    };
  }
  return { range: { start: origin.insertAt, end: origin.insertAt }, newText: ` ${polarity}` };
}
