// Bundles the extension client, the language server, the terminal checker and the panel script.
import * as esbuild from 'esbuild';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';

const watch = process.argv.includes('--watch');
const common = { bundle: true, sourcemap: true, logLevel: 'warning', target: 'node20' };

/** The chart drawing code as a browser script defining the global `AmpnoteCharts`. */
const chartsScript = {
  ...common,
  entryPoints: ['shared/src/charts/draw.ts'],
  platform: 'browser',
  format: 'iife',
  globalName: 'AmpnoteCharts',
  target: 'es2022',
};

/**
 * `import text from './module?script'` (declared in cli/src/scriptImport.d.ts): the module bundled as a
 * browser script, and its text as the import. The report page inlines the same chart code the panel runs,
 * and the dependency is an import the compiler and the bundler follow, not a file read at run time.
 */
const scriptImports = {
  name: 'script-imports',
  setup(build) {
    build.onResolve({ filter: /\?script$/ }, (args) => ({
      path: resolve(args.resolveDir, args.path.replace(/\?script$/, '')) + '.ts',
      namespace: 'script',
    }));
    build.onLoad({ filter: /.*/, namespace: 'script' }, async (args) => {
      const out = await esbuild.build({
        ...chartsScript,
        entryPoints: [args.path],
        sourcemap: false,
        write: false,
        metafile: true,
      });
      return {
        contents: out.outputFiles[0].text,
        loader: 'text',
        resolveDir: dirname(args.path),
        watchFiles: Object.keys(out.metafile.inputs).map((p) => resolve(p)),
      };
    });
  },
};

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
    plugins: [scriptImports],
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
  // The chart script on its own, as the report inlines it (dist/charts.js is a published bundle name).
  { ...chartsScript, outfile: 'dist/charts.js' },
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
