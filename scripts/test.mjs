// `npm test`: every layer in order, then one closing line `N passed, N failed` over all of them.
// Build, type check and formatting are counted as one check each; vitest layers report their own tests;
// the real-editor suite prints its own `N passed, N failed` line, which is added in.
import { spawnSync } from 'node:child_process';
import { mkdirSync, readFileSync, existsSync } from 'node:fs';

mkdirSync('test-output', { recursive: true });
let passed = 0;
let failed = 0;

function step(name, cmd, args) {
  console.log(`\n── ${name}: ${cmd} ${args.join(' ')}`);
  const run = spawnSync(cmd, args, { stdio: 'inherit' });
  return run.status === 0;
}

function counted(name, cmd, args) {
  if (step(name, cmd, args)) passed++;
  else {
    failed++;
    console.error(`✗ ${name} failed`);
  }
}

counted('build', 'npm', ['run', '-s', 'build']);
counted('type check', 'npm', ['run', '-s', 'typecheck']);
counted('format check', 'npm', ['run', '-s', 'format:check']);

const vitestJson = 'test-output/vitest.json';
const vitestOk = step('unit, protocol, cli and webview tests', 'npx', [
  'vitest',
  'run',
  '--reporter=default',
  '--reporter=json',
  `--outputFile.json=${vitestJson}`,
]);
if (existsSync(vitestJson)) {
  const r = JSON.parse(readFileSync(vitestJson, 'utf8'));
  passed += r.numPassedTests ?? 0;
  failed += (r.numFailedTests ?? 0) + (r.numFailedTestSuites ?? 0);
  if (!vitestOk && !r.numFailedTests && !r.numFailedTestSuites) failed++;
} else if (!vitestOk) failed++;

console.log('\n── editor tests: node test/editor/run.mjs');
const editor = spawnSync('node', ['test/editor/run.mjs'], {
  stdio: ['ignore', 'pipe', 'inherit'],
  encoding: 'utf8',
});
process.stdout.write(editor.stdout ?? '');
const m = /^(\d+) passed, (\d+) failed/m.exec(editor.stdout ?? '');
if (m) {
  passed += Number(m[1]);
  failed += Number(m[2]);
}
if (editor.status !== 0 && (!m || Number(m[2]) === 0)) failed++;

console.log(`\n${passed} passed, ${failed} failed`);
process.exit(failed === 0 ? 0 : 1);
