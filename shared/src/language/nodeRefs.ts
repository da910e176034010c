// Comparing node references: ground is one node, a named node is its name.
import type { NodeRef } from './model';

export const sameRef = (a: NodeRef, b: NodeRef): boolean =>
  a.kind === b.kind && (a.kind === 'ground' || (b.kind === 'node' && a.name === b.name));
