// The root locus along a sweep as tracks: each root followed from one value to the next. Roots sorted by
// magnitude swap places where two cross; following each root to its nearest successor keeps a track on
// one root, so a line on the chart is the path one pole (or zero) takes as the parameter moves.
import type { Complex } from '../analysis/types';
import type { LocusSample } from './sweepDesign';

export interface LocusTrackPoint {
  readonly value: number;
  readonly s: Complex;
}

export type LocusTrack = readonly LocusTrackPoint[];

/** Distance between two roots on a scale where a decade counts the same at any magnitude. */
function distance(a: Complex, b: Complex): number {
  const ma = Math.hypot(a.re, a.im);
  const mb = Math.hypot(b.re, b.im);
  const scale = Math.max(ma, mb) || 1;
  return Math.hypot(a.re - b.re, a.im - b.im) / scale;
}

/**
 * Tracks of the poles or zeros along the samples: at each step every open track takes its nearest root
 * (closest pairs first); a root left over starts a new track, a track left without a root ends.
 */
export function locusTracks(samples: readonly LocusSample[], pick: (s: LocusSample) => readonly Complex[]) {
  const tracks: LocusTrackPoint[][] = [];
  let open: number[] = [];
  for (const sample of samples) {
    const roots = pick(sample).filter((s) => Number.isFinite(s.re) && Number.isFinite(s.im));
    const pairs: { t: number; r: number; d: number }[] = [];
    for (const t of open) {
      const last = tracks[t]!.at(-1)!.s;
      roots.forEach((s, r) => pairs.push({ t, r, d: distance(last, s) }));
    }
    pairs.sort((a, b) => a.d - b.d);
    const takenT = new Set<number>();
    const takenR = new Set<number>();
    for (const p of pairs) {
      if (takenT.has(p.t) || takenR.has(p.r)) continue;
      takenT.add(p.t);
      takenR.add(p.r);
      tracks[p.t]!.push({ value: sample.value, s: roots[p.r]! });
    }
    const next = open.filter((t) => takenT.has(t));
    roots.forEach((s, r) => {
      if (takenR.has(r)) return;
      tracks.push([{ value: sample.value, s }]);
      next.push(tracks.length - 1);
    });
    open = next;
  }
  return tracks;
}
