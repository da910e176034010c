// Figures for the editor loop: keystroke → diagnostics computed (debounce excluded), a 1,000-design file
// (first analysis, an edit in one design), the server's resident memory on that file, and its start time.
// Prints numbers only; it never passes or fails on timing.
import { execFileSync } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { analyzeDocument, createAnalysisCache } from '../shared/src/service';
import { LspClient, waitFor } from '../test/protocol/lspClient';
import { hasSweeps, sweepDocumentSteps } from '../shared/src/sweep/sweepDocument';
import { median } from './lib/timing';

const ROOT = process.cwd();
const ms = (x: number) => `${x.toFixed(2)} ms`;

/** An invented family of two-stage designs, each slightly different, some with corners. */
function generated(count: number): string {
  const out: string[] = ['# Generated for benchmarking: invented two-stage variants.'];
  for (let i = 0; i < count; i++) {
    const gm1 = 80 + (i % 17) * 5;
    const ratio = 3 + (i % 11);
    const cc = (0.6 + (i % 9) * 0.15).toFixed(2);
    const rz = i % 3 === 0 ? `  rz = ${(2 + (i % 7)).toFixed(1)} kohm` : '';
    out.push(
      `design variant_${i}`,
      `  param gm1 = ${gm1} uS`,
      `  param gm2 = ${ratio} * gm1`,
      `  stage first   gm = gm1  rout = 2 Mohm    cap = 150 fF  bias = 10 uA`,
      `  stage second  gm = gm2  rout = 200 kohm  cap = 200 fF  bias = 100 uA  inverting`,
      `  load cap = ${1 + (i % 4)} pF res = 2 Mohm`,
      `  miller first -> second  cc = ${cc} pF${rz}`,
      `  require ugf >= 8 MHz`,
      `  require pm >= 55 deg`,
      ...(i % 4 === 0 ? [`  corner slow gm1 = ${gm1 * 0.8} uS`, `  corner fast gm1 = ${gm1 * 1.2} uS`] : []),
      'end',
      '',
    );
  }
  return out.join('\n');
}

interface Timing {
  readonly wall: number;
  readonly cpu: number;
}
const timed = (f: () => void): Timing => {
  const c = process.cpuUsage();
  const t = performance.now();
  f();
  return { wall: performance.now() - t, cpu: (process.cpuUsage(c).user + process.cpuUsage(c).system) / 1000 };
};
const show = (t: Timing) => `${ms(t.wall)} wall, ${ms(t.cpu)} CPU`;

/**
 * The server's own cache settings: the step response only where a design asks for settling, and sweeps
 * left to a second pass after the ordinary diagnostics are published.
 */
const serverCache = () => createAnalysisCache({ stepResponse: 'when-required', sweeps: 'deferred' });

/** The second pass alone (every sweep of the document, nothing reused): what follows the first publish. */
function sweepPass(text: string, rounds = 10): Timing | undefined {
  const report = analyzeDocument(text, undefined, undefined, serverCache());
  if (!hasSweeps(report)) return undefined;
  const run = () => {
    const steps = sweepDocumentSteps(report, undefined, new Map());
    while (!steps.next().done);
  };
  run();
  const times: Timing[] = [];
  for (let i = 0; i < rounds; i++) times.push(timed(run));
  return { wall: median(times.map((t) => t.wall)), cpu: median(times.map((t) => t.cpu)) };
}

function keystrokeInProcess(text: string, edit: (text: string, i: number) => string, rounds = 30): Timing {
  const cache = serverCache();
  analyzeDocument(text, undefined, undefined, cache);
  const times: Timing[] = [];
  for (let i = 1; i <= rounds; i++) {
    const next = edit(text, i);
    times.push(timed(() => analyzeDocument(next, undefined, undefined, cache)));
  }
  return { wall: median(times.map((t) => t.wall)), cpu: median(times.map((t) => t.cpu)) };
}

/** Change the first written number of a stage, load or Miller line: that design is re-analysed, the others come from the cache. */
const editValue = (text: string, i: number) =>
  text.replace(
    /^(\s*(?:stage|load|miller)\b[^#\n]*?=\s*)([\d.]+)/m,
    (_, head: string, v: string) => `${head}${(Number(v) * (1 + i / 1000)).toPrecision(6)}`,
  );

async function main() {
  execFileSync(process.execPath, ['scripts/build.mjs'], { cwd: ROOT, stdio: 'inherit' });

  console.log(
    'keystroke → diagnostics computed, in process (median of 30 edits, debounce excluded; target ≤ 30 ms)',
  );
  for (const file of readdirSync(resolve(ROOT, 'examples')).filter((f) => f.endsWith('.ampnote'))) {
    const text = readFileSync(resolve(ROOT, 'examples', file), 'utf8');
    console.log(`  ${file.padEnd(36)} ${show(keystrokeInProcess(text, editValue))}`);
    const sweeps = sweepPass(text);
    if (sweeps) console.log(`  ${''.padEnd(36)} then its sweeps (second publish) ${show(sweeps)}`);
  }

  const big = generated(1000);
  let first = analyzeDocument('');
  const full = timed(() => (first = analyzeDocument(big, undefined, undefined, serverCache())));
  console.log(`1,000-design file (${big.split('\n').length} lines, ${first.findings.length} findings)`);
  console.log(`  first full analysis (as the server runs it)  ${show(full)} (target ≤ 1500 ms)`);
  console.log(`  first full analysis with every step response ${show(timed(() => analyzeDocument(big)))}`);
  const edit = (text: string, i: number) =>
    text.replace('design variant_500\n  param gm1 = ', `design variant_500\n  param gm1 = ${i}`);
  console.log(
    `  edit inside one design (median of 15)        ${show(keystrokeInProcess(big, edit, 15))} (target ≤ 30 ms)`,
  );
  const newline = (text: string, i: number) =>
    text.replace('design variant_500\n', `design variant_500\n${'\n'.repeat(i)}`);
  console.log(
    `  new line inside one design (median of 15)    ${show(keystrokeInProcess(big, newline, 15))} (moves 499 designs)`,
  );
  const load = readFileSync('/proc/loadavg', 'utf8').split(' ').slice(0, 3).join(' ');
  console.log(`  (machine load average while measuring: ${load}; 2 cores shared)`);

  const { client, readyMs } = await LspClient.start();
  try {
    console.log(`server ready (spawn → initialize answered) ${ms(readyMs)} (target ≤ 300 ms)`);
    for (const file of readdirSync(resolve(ROOT, 'examples')).filter((f) => f.endsWith('.ampnote'))) {
      const text = readFileSync(resolve(ROOT, 'examples', file), 'utf8');
      const euri = `file:///bench/${file}`;
      client.open(euri, text);
      await client.diagnosticsFor(euri, 1, 60_000);
      const lags: number[] = [];
      const sweptLags: number[] = [];
      // A document with sweeps is published a second time once they have run.
      const swept = /^\s*sweep\s/m.test(text);
      for (let i = 1; i <= 10; i++) {
        const t = performance.now();
        const v = client.change(euri, editValue(text, i));
        await client.diagnosticsFor(euri, v, 60_000);
        lags.push(performance.now() - t - 200);
        if (!swept) continue;
        await waitFor(
          () =>
            (client.published.get(euri) ?? []).filter((p) => p.version === v).length >= 2 ? true : undefined,
          60_000,
          'the sweeps’ publish',
        );
        sweptLags.push(performance.now() - t - 200);
      }
      console.log(
        `  server: ${file.padEnd(32)} edit → diagnostics minus the 200 ms debounce ${ms(median(lags))}${
          swept ? `; with the sweeps' findings ${ms(median(sweptLags))}` : ''
        }`,
      );
      client.close(euri);
    }
    const uri = 'file:///bench/big.ampnote';
    const tOpen = performance.now();
    client.open(uri, big);
    await client.diagnosticsFor(uri, 1, 120_000);
    console.log(`  server: open → diagnostics (1,000 designs) ${ms(performance.now() - tOpen)}`);
    const rss = readFileSync(`/proc/${client.proc.pid}/status`, 'utf8').match(/VmRSS:\s+(\d+) kB/);
    console.log(
      `  server resident memory on that file     ${rss ? `${(Number(rss[1]) / 1024).toFixed(1)} MB` : 'unavailable'} (target ≤ 200 MB)`,
    );
    const lags: number[] = [];
    let text = big;
    for (let i = 1; i <= 10; i++) {
      text = edit(big, i);
      const t = performance.now();
      const v = client.change(uri, text);
      await client.diagnosticsFor(uri, v, 60_000);
      lags.push(performance.now() - t - 200);
    }
    console.log(`  server: edit → diagnostics minus the 200 ms debounce (median of 10) ${ms(median(lags))}`);
  } finally {
    await client.stop();
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
