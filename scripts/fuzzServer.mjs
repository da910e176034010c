// A large fuzz of the bundled language server, run by hand: prints documents, requests, crashes, hangs,
// bad strings, bad ranges and the slowest response (the protocol test runs a small one in CI).
//   node scripts/fuzzServer.mjs [--documents N] [--requests N] [--seed N] [--bound-ms N]
// Builds first (npm run build), then bundles the fuzz (test/protocol/serverFuzz.ts) to run it under node.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import * as esbuild from 'esbuild';

const arg = (name, fallback) => {
  const i = process.argv.indexOf(`--${name}`);
  const v = i < 0 ? undefined : Number(process.argv[i + 1]);
  return Number.isFinite(v) ? v : fallback;
};
const options = {
  documents: arg('documents', 2000),
  requestsPerDocument: arg('requests', 8),
  seed: arg('seed', Date.now() % 1_000_000),
  boundMs: arg('bound-ms', 30_000),
};

execFileSync(process.execPath, ['scripts/build.mjs'], { stdio: 'inherit' });
const dir = mkdtempSync(join(tmpdir(), 'ampnote-fuzz-'));
const out = join(dir, 'fuzz.cjs');
await esbuild.build({
  entryPoints: ['test/protocol/serverFuzz.ts'],
  bundle: true,
  platform: 'node',
  format: 'cjs',
  outfile: out,
  logLevel: 'warning',
  // The bundle lives in a temporary folder: paths to the examples and dist/ are the checkout's.
  define: { __dirname: JSON.stringify(join(process.cwd(), 'test', 'protocol')) },
});
const { fuzzServer } = (await import(pathToFileURL(out).href)).default;

console.log(`fuzzing the server: ${JSON.stringify(options)}`);
const t0 = Date.now();
const figures = await fuzzServer({
  ...options,
  onDocument: (done, f) => {
    if (done % 100 === 0)
      console.log(
        `  ${done} documents, ${f.requests} requests, ${f.crashes} crashes, ${f.hangs} hangs, ` +
          `${f.badStrings} bad strings, ${f.badRanges} bad ranges`,
      );
  },
});
rmSync(dir, { recursive: true, force: true });
console.log(`
documents       ${figures.documents}
requests        ${figures.requests}
crashes         ${figures.crashes}
hangs           ${figures.hangs} (bound ${options.boundMs} ms)
bad strings     ${figures.badStrings}
bad ranges      ${figures.badRanges}
slowest         ${figures.slowestMs.toFixed(0)} ms (${figures.slowest})
wall time       ${((Date.now() - t0) / 1000).toFixed(0)} s
seed            ${options.seed}`);
for (const e of figures.examples) console.log(`- ${e}`);
process.exitCode = figures.crashes + figures.hangs + figures.badStrings + figures.badRanges > 0 ? 1 : 0;
