// Nodes that nothing connects: a declared node with no element attached is almost always a slip.
import { quote } from './diagnostics';
import type { DesignScope } from './designScope';
import { tokenRange } from './lexer';
import { kindOf } from './statements';

/** Warns about declared nodes that nothing attaches to (from the text, so broken statements still count). */
export function checkConnections(scope: DesignScope): void {
  const attached = new Set<string>();
  const sensed = new Set<string>();
  for (const s of scope.design.statements)
    for (const m of kindOf(s).nodes(s)) (m.use === 'attached' ? attached : sensed).add(m.token.text);
  for (const [name, d] of scope.decls) {
    // A supply is held by its source: connected by declaration.
    if (d.kind !== 'node' || d.statement.kind === 'supply') continue;
    if (attached.has(name) || scope.design.brokenMentions.has(name)) continue;
    scope.sink.warning(
      'reference',
      sensed.has(name)
        ? `Nothing connects to node ${quote(name)}: it is only sensed, so its voltage is undefined.`
        : `Node ${quote(name)} is declared but nothing connects to it.`,
      tokenRange(d.token),
    );
  }
}
