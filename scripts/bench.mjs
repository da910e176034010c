// Runs every bench/*.bench.ts: each is bundled with esbuild and run in its own Node process, printing figures.
// Benchmarks report numbers; they never pass or fail on timing.
import * as esbuild from 'esbuild';
import { readdirSync, mkdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

const only = process.argv[2];
const files = readdirSync('bench')
  .filter((f) => f.endsWith('.bench.ts') && (!only || f.includes(only)))
  .sort();
mkdirSync('.cache/bench', { recursive: true });
let failed = 0;
for (const file of files) {
  const out = join('.cache/bench', file.replace(/\.ts$/, '.cjs'));
  await esbuild.build({
    entryPoints: [join('bench', file)],
    outfile: out,
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'node20',
    logLevel: 'warning',
  });
  console.log(`\n== ${file}`);
  const run = spawnSync(process.execPath, ['--expose-gc', out], { stdio: 'inherit' });
  if (run.status !== 0) failed++;
}
if (failed) {
  console.error(`${failed} benchmark script(s) exited with an error`);
  process.exit(1);
}
