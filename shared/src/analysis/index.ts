// The analysis engine's public surface.
export { buildNetwork, millerMidpointName, bufferInputName, type BuildResult } from '../circuit/buildNetwork';
export type { Network, NetworkNode } from '../circuit/network';
export { analyzeDesign, type AnalyzeOptions } from './analyzeDesign';
export {
  openLoopResponse,
  loopResponse,
  openLoopResponsePz,
  loopResponsePz,
  type BodeResult,
} from './responses';
export { withValue, valueOf, type CompensationTarget } from './variants';
export { sweepCompensation } from './sweep';
export { solveRzForZeroAtInfinity, solveRzToCancelPole } from './synthesis';
export { analyzeCorners, worstCase } from './corners';
export { classicTwoStage, type ClassicTwoStage } from './handEstimates';
export type * from './types';
