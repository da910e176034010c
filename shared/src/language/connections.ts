// Nodes that nothing connects: a declared node with no element attached is almost always a slip.
import { quote } from './diagnostics';
import type { DesignScope } from './designScope';
import { tokenRange } from './lexer';

/** Warns about declared nodes that nothing attaches to (from the text, so broken statements still count). */
export function checkConnections(scope: DesignScope): void {
  const attached = new Set<string>();
  const sensed = new Set<string>();
  for (const s of scope.design.statements) {
    switch (s.kind) {
      case 'stage':
        if (s.from) sensed.add(s.from.text);
        break;
      case 'load':
        if (s.at) attached.add(s.at.text);
        break;
      case 'miller':
      case 'indirect':
        if (s.from) attached.add(s.from.text);
        if (s.to) attached.add(s.to.text);
        break;
      case 'feedforward':
        if (s.from) sensed.add(s.from.text);
        if (s.to) attached.add(s.to.text);
        break;
      case 'element':
        if (s.element === 'gm') {
          if (s.a) sensed.add(s.a.text);
        } else if (s.a) attached.add(s.a.text);
        if (s.b) attached.add(s.b.text);
        break;
      case 'output':
        if (s.node) sensed.add(s.node.text);
        break;
      default:
        break;
    }
  }
  for (const [name, d] of scope.decls) {
    if (d.kind !== 'node' || attached.has(name) || scope.design.brokenMentions.has(name)) continue;
    scope.sink.warning(
      'reference',
      sensed.has(name)
        ? `Nothing connects to node ${quote(name)}: it is only sensed, so its voltage is undefined.`
        : `Node ${quote(name)} is declared but nothing connects to it.`,
      tokenRange(d.token),
    );
  }
}
