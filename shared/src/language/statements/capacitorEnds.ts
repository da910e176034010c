// The two nodes of a compensation capacitor (`miller`, `indirect`): both checked, neither ground, and
// different from each other.
import { quote } from '../diagnostics';
import { spanRange, type Token } from '../lexer';
import type { NodeName } from '../model';
import type { BuildContext } from './statementKind';

interface CapacitorStatement {
  readonly kind: 'miller' | 'indirect';
  readonly from?: Token;
  readonly to?: Token;
}

export interface CapacitorEnds {
  readonly from: NodeName | undefined;
  readonly to: NodeName | undefined;
}

/** Resolves both ends, reporting each that is undefined or ground. */
export function resolveCapacitorEnds(s: CapacitorStatement, ctx: BuildContext): CapacitorEnds {
  const what = `A ${s.kind} capacitor's node`;
  return {
    from: s.from && ctx.resolveNodeName(s.from, what),
    to: s.to && ctx.resolveNodeName(s.to, what),
  };
}

/** Both ends, when they resolved and differ (a capacitor from a node to itself is reported). */
export function distinctEnds(
  s: CapacitorStatement,
  ends: CapacitorEnds,
  ctx: BuildContext,
): { from: NodeName; to: NodeName } | undefined {
  const { from, to } = ends;
  if (!from || !to) return undefined;
  if (from === to) {
    ctx.sink.error('reference', `${quote(s.kind)} needs two different nodes.`, spanRange(s.from!, s.to!));
    return undefined;
  }
  return { from, to };
}
