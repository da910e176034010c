// The nodes of a design, in text order: the input, then every stage and declared node, then `out` when the
// text only mentions it.
import type { DesignScope } from './designScope';
import { tokenRange } from './lexer';
import type { NodeDecl } from './model';
import { node } from './nodeName';

export function listNodes(scope: DesignScope): NodeDecl[] {
  const nodes: NodeDecl[] = [];
  const inMention = scope.nodeRefs.find((t) => t.text === 'in');
  nodes.push({ name: node('in'), kind: 'input', ...(inMention ? { range: tokenRange(inMention) } : {}) });
  for (const d of scope.decls.values())
    if (d.kind !== 'param')
      nodes.push({
        name: node(d.token.text),
        kind: d.kind === 'stage' ? 'stage' : 'declared',
        range: tokenRange(d.token),
      });
  if (scope.mentionsOut()) {
    const first = scope.nodeRefs.find((t) => t.text === 'out')!;
    nodes.push({ name: node('out'), kind: 'output', range: tokenRange(first) });
  }
  return nodes;
}
