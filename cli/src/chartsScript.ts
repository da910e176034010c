// The report page draws its charts with the panel's own chart module, inlined as a browser script that
// defines the global `AmpnoteCharts` (the build bundles it into dist/cli.js; see scripts/build.mjs).
import script from '../../shared/src/charts/draw?script';

export const CHARTS_SCRIPT: string = script;
