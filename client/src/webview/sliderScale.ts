// Logarithmic sliders: positions 0…STEPS map to values min…max geometrically. With `allowZero` (the nulling
// resistor), position 0 means "none" and the logarithmic span starts at position 1.
import type { SliderRange } from '../../../shared/src/protocol/panelData';

export const STEPS = 1000;

export function positionToValue(position: number, range: SliderRange, allowZero: boolean): number {
  const p = Math.min(STEPS, Math.max(0, Math.round(position)));
  if (allowZero && p === 0) return 0;
  const lo = allowZero ? 1 : 0;
  const f = (p - lo) / (STEPS - lo);
  // Three significant digits: the value lands in the file as written text, and more digits mean nothing.
  return Number((range.min * (range.max / range.min) ** f).toPrecision(3));
}

export function valueToPosition(value: number, range: SliderRange, allowZero: boolean): number {
  if (allowZero && !(value > 0)) return 0;
  const lo = allowZero ? 1 : 0;
  const f = Math.log(value / range.min) / Math.log(range.max / range.min);
  return Math.min(STEPS, Math.max(lo, Math.round(lo + f * (STEPS - lo))));
}

/** A free parameter's slider: geometric between positive bounds, else linear; 3 significant digits. */
export function freePositionToValue(
  position: number,
  slider: { readonly low: number; readonly high: number; readonly log: boolean },
): number {
  const f = Math.min(STEPS, Math.max(0, Math.round(position))) / STEPS;
  const { low, high } = slider;
  const raw = slider.log ? low * (high / low) ** f : low + f * (high - low);
  // Rounding may step past a bound written with more digits: the value stays within the bounds.
  return Math.min(high, Math.max(low, Number(raw.toPrecision(3))));
}

export function freeValueToPosition(
  value: number,
  slider: { readonly low: number; readonly high: number; readonly log: boolean },
): number {
  const { low, high } = slider;
  if (!(high > low)) return 0;
  const f = slider.log ? Math.log(value / low) / Math.log(high / low) : (value - low) / (high - low);
  return Math.min(STEPS, Math.max(0, Math.round(f * STEPS)));
}
