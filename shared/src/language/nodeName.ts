// The one place a checked name becomes a NodeName.
import type { NodeName } from './model';

/** Only the evaluator turns a checked name into a NodeName. */
export const node = (name: string): NodeName => name as NodeName;
