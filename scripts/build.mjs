// Bundles the extension client, the language server, the terminal checker and the panel script.
import * as esbuild from 'esbuild';
import { mkdirSync } from 'node:fs';

const watch = process.argv.includes('--watch');
const common = { bundle: true, sourcemap: true, logLevel: 'warning', target: 'node20' };

const entries = [
  {
    ...common,
    entryPoints: ['client/src/extension.ts'],
    outfile: 'dist/client.js',
    platform: 'node',
    format: 'cjs',
    external: ['vscode'],
  },
  {
    ...common,
    entryPoints: ['server/src/server.ts'],
    outfile: 'dist/server.js',
    platform: 'node',
    format: 'cjs',
  },
  {
    ...common,
    entryPoints: ['cli/src/main.ts'],
    outfile: 'dist/cli.js',
    platform: 'node',
    format: 'cjs',
    banner: { js: '#!/usr/bin/env node' },
  },
  // The panel script runs in the webview: a browser bundle with chart.js inside, served from media/.
  {
    ...common,
    entryPoints: ['client/src/webview/panel.ts'],
    outfile: 'client/media/panel.js',
    platform: 'browser',
    format: 'iife',
    target: 'es2022',
  },
  // The same chart code as a global `AmpnoteCharts`, for the terminal checker's self-contained HTML report.
  {
    ...common,
    entryPoints: ['client/src/webview/charts.ts'],
    outfile: 'dist/charts.js',
    platform: 'browser',
    format: 'iife',
    globalName: 'AmpnoteCharts',
    target: 'es2022',
  },
];

mkdirSync('dist', { recursive: true });
const present = (
  await Promise.all(entries.map(async (e) => ((await exists(e.entryPoints[0])) ? e : null)))
).filter(Boolean);
if (watch) {
  for (const e of present) await (await esbuild.context(e)).watch();
} else {
  await Promise.all(present.map((e) => esbuild.build(e)));
}

async function exists(p) {
  const { access } = await import('node:fs/promises');
  try {
    await access(p);
    return true;
  } catch {
    return false;
  }
}
