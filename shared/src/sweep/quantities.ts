// The three loop figures a sweep is drawn by, as people read them: the short name on the chart and in a
// requirement's label, and the value's text. The panel's data and the sweep chart both read this table.
import { formatDb, formatDeg, formatHz } from '../format/si';
import type { SweepQuantity } from '../protocol/panelData';

export const SWEEP_QUANTITY: Readonly<
  Record<SweepQuantity, { readonly short: string; readonly text: (v: number) => string }>
> = {
  phaseMarginDeg: { short: 'PM', text: formatDeg },
  ugfHz: { short: 'UGF', text: (v) => formatHz(v) },
  gainMarginDb: { short: 'GM', text: formatDb },
};
