// All design rules, and the mapping of language diagnostics into findings.
import type { LanguageDiagnostic } from '../language/source';
import type { ParsedDocument } from '../language/model';
import type { SourcePosition, SourceRange } from '../language/source';
import { approximationCheck } from './approximation';
import { complexPolesCheck } from './complexPoles';
import {
  closedLoopGainCheck,
  loadStepCheck,
  outputImpedanceCheck,
  supplyRejectionCheck,
} from './closedLoopRequirements';
import type { Check, CheckInput } from './context';
import { dcGainCheck } from './dcGain';
import { doubletCheck } from './doublet';
import { gainMarginCheck } from './gainMargin';
import { gmRatioCheck } from './gmRatio';
import { nondominantPoleCheck } from './nondominantPole';
import { phaseMarginCheck } from './phaseMargin';
import { rhpZeroCheck } from './rhpZero';
import { secondStageBandwidthCheck } from './secondStageBandwidth';
import { settlingCheck } from './settling';
import { slewRateCheck } from './slewRate';
import { stabilityCheck } from './stability';
import type { CheckCode, Finding } from './types';
import { unityGainCheck } from './unityGain';

export type { Check, CheckEngine, CheckInput } from './context';

/** Every design rule with its code, in the order findings are listed. */
export const ALL_CHECKS: readonly (readonly [CheckCode, Check])[] = [
  ['stability', stabilityCheck],
  ['phase-margin', phaseMarginCheck],
  ['gain-margin', gainMarginCheck],
  ['ugf', unityGainCheck],
  ['rhp-zero', rhpZeroCheck],
  ['gm-ratio', gmRatioCheck],
  ['nondominant-pole', nondominantPoleCheck],
  ['second-stage-bandwidth', secondStageBandwidthCheck],
  ['complex-poles', complexPolesCheck],
  ['doublet', doubletCheck],
  ['slew-rate', slewRateCheck],
  ['settling', settlingCheck],
  ['dc-gain', dcGainCheck],
  ['closed-loop-gain', closedLoopGainCheck],
  ['output-impedance', outputImpedanceCheck],
  ['supply-rejection', supplyRejectionCheck],
  ['load-step', loadStepCheck],
  ['approximation', approximationCheck],
];

/** Run every rule on one analysed design. A rule that throws is reported, never allowed to stop the rest. */
export function runChecks(input: CheckInput): Finding[] {
  const findings: Finding[] = [];
  for (const [code, check] of ALL_CHECKS) {
    if (input.token?.isCancellationRequested) break;
    try {
      findings.push(...check(input));
    } catch (error) {
      findings.push({
        code,
        severity: 'info',
        message: `The ${code} rule could not be evaluated for this design: ${error instanceof Error ? error.message : String(error)}`,
        design: input.source.name,
        range: input.source.nameRange,
        related: [],
        fixes: [],
      });
    }
  }
  return findings;
}

const before = (a: SourcePosition, b: SourcePosition) =>
  a.line < b.line || (a.line === b.line && a.character <= b.character);
export const rangeContains = (outer: SourceRange, inner: SourceRange): boolean =>
  before(outer.start, inner.start) && before(inner.end, outer.end);

/** Language diagnostics as findings, each attached to the design whose block contains it. */
export function languageFindings(parsed: ParsedDocument): Finding[] {
  return parsed.diagnostics.map((d: LanguageDiagnostic) => {
    const design = parsed.designs.find((s) => rangeContains(s.range, d.range));
    return {
      code: d.code,
      severity: d.severity,
      message: d.message,
      ...(design ? { design: design.name } : {}),
      range: d.range,
      related: d.related ?? [],
      fixes: [],
    };
  });
}
