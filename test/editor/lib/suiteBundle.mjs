// Bundles the extension-host suite (TypeScript) into one CommonJS module exporting run().
import * as esbuild from 'esbuild';
import { join } from 'node:path';

export async function bundleSuite(root, outDir) {
  const outfile = join(outDir, 'index.js');
  await esbuild.build({
    entryPoints: [join(root, 'test', 'editor', 'suite', 'index.ts')],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'node20',
    external: ['vscode'],
    sourcemap: 'inline',
    logLevel: 'warning',
  });
  return outfile;
}
