// Tests inside a real editor: the browser build of VS Code (code-server, installed into .cache) with this
// extension, driven three ways — the extension-host suite with the real `vscode` API, the UI through
// Chromium, and the packaged .vsix installed as a user would. Prints `N passed, N failed` last.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  editorDir,
  installEditor,
  installVsix,
  isAlive,
  missingPrerequisites,
  root,
  startEditor,
} from '../../scripts/editor.mjs';
import { launchBrowser, openWorkbench, poll, screenshot } from './lib/browser.mjs';
import { expectationsFor, scratchWorkspace, suiteFiles } from './lib/prepare.mjs';
import { Tally } from './lib/tally.mjs';
import { uiChecks, smokeChecks } from './lib/uiChecks.mjs';

const OUTPUT = join(root, 'test-output', 'editor');
// `--only host,ui,packaged` runs some of the three parts (for working on one); the default is all.
const onlyArg = process.argv.find((a) => a.startsWith('--only='))?.slice('--only='.length);
const parts = new Set((onlyArg ?? 'host,ui,packaged').split(','));
// Each run keeps its files apart (runs started at the same time in one tree must not share them) and
// removes them when it ends; a run that was killed leaves its folder to the next run to clear.
const RUN_DIR = join(editorDir, 'runs', String(process.pid));
const WORK = join(RUN_DIR, 'work');
const started = Date.now();
const tally = new Tally();
/** Everything started here, stopped in reverse order on any exit. */
const running = [];

async function stopAll() {
  while (running.length > 0) {
    const r = running.pop();
    try {
      await r.stop();
    } catch {
      // already gone
    }
  }
}

for (const sig of ['SIGINT', 'SIGTERM']) {
  process.once(sig, async () => {
    await stopAll();
    clearRunFolders({ mine: true });
    process.exit(130);
  });
}

/** The whole run may not exceed this; past it everything is stopped and the run fails. */
const WATCHDOG_MS = Number(process.env.AMPNOTE_EDITOR_TIMEOUT_MS ?? 15 * 60_000);
const watchdog = setTimeout(async () => {
  console.error(`editor tests: over ${WATCHDOG_MS / 1000} s, stopping everything`);
  await stopAll();
  clearRunFolders({ mine: true });
  console.log(`${tally.passed} passed, ${tally.failed + 1} failed`);
  process.exit(1);
}, WATCHDOG_MS);
watchdog.unref();

function step(what) {
  console.log(`\n== ${what} (${((Date.now() - started) / 1000).toFixed(1)} s)`);
}

/** Removes this run's folders, and those of earlier runs whose process is gone. */
function clearRunFolders({ mine }) {
  const runs = join(editorDir, 'runs');
  const profiles = join(editorDir, 'profiles');
  const gone = (pid) => (pid === process.pid ? mine : !isAlive(pid));
  for (const name of existsSync(runs) ? readdirSync(runs) : []) {
    if (gone(Number(name))) rmSync(join(runs, name), { recursive: true, force: true });
  }
  for (const name of existsSync(profiles) ? readdirSync(profiles) : []) {
    const m = name.match(/^run-(\d+)-/);
    if (m && gone(Number(m[1]))) rmSync(join(profiles, name), { recursive: true, force: true });
  }
}

async function main() {
  clearRunFolders({ mine: false });
  rmSync(OUTPUT, { recursive: true, force: true });
  mkdirSync(OUTPUT, { recursive: true });

  step('build');
  if (buildIsStale()) {
    const b = spawnSync('npm', ['run', 'build'], { cwd: root, stdio: 'inherit' });
    if (b.status !== 0) throw new Error('npm run build failed');
  } else console.log('  dist/ is newer than the sources; not rebuilt');

  step('editor install');
  const ready = await tally.check('the machine has what the editor tests need', async () => {
    const missing = missingPrerequisites();
    if (missing.length > 0) throw new Error(`Missing:\n  - ${missing.join('\n  - ')}`);
  });
  if (!ready) return;
  const installed = await tally.check(
    'code-server is installed (or reused from .cache/editor)',
    async () => installEditor({ log: (s) => console.log(`  ${s}`) }),
    10 * 60_000,
  );
  if (!installed) return;

  step('expectations from the terminal checker');
  const prepared = await tally.check('the examples are copied into a scratch workspace', async () =>
    scratchWorkspace(root, WORK),
  );
  if (!prepared) return;
  const { workspace, files } = prepared;
  const expected = await tally.check(`the terminal checker reports on ${files.length} example(s)`, async () =>
    expectationsFor(root, workspace, files),
  );
  if (!expected) return;
  for (const e of expected) {
    const counts = countBy(e.findings.map((f) => `${f.code}/${f.severity}`));
    console.log(`  ${e.file}: ${e.findings.length} finding(s) ${JSON.stringify(counts)}`);
  }
  const suite = await suiteFiles(root, join(RUN_DIR, 'suite'), workspace, expected);

  step('editor start');
  const editor = await startEditor({
    profile: `run-${process.pid}-dev`,
    fresh: true,
    env: { AMPNOTE_EDITOR_SUITE: suite.config },
  });
  running.push(editor);
  watchEditor(editor, 'dev');
  console.log(`  code-server on ${editor.url}`);
  const browser = await launchBrowser(join(editorDir, 'xdg', 'browser'));
  running.push({ stop: () => browser.close() });

  if (parts.has('host')) {
    step('extension-host suite (real vscode API)');
    suite.writeConfig('full');
    await hostSuite(browser, editor, workspace, suite.entry, suite.results, root, 'host');
  }

  if (parts.has('ui')) {
    step('UI through Chromium');
    const consoleLines = [];
    const page = await openWorkbench(
      browser,
      editor.pageUrl({ folder: workspace, extensionDevelopmentPath: root }),
      { consoleLines },
    );
    try {
      await uiChecks({ page, tally, expected, workspace, output: OUTPUT, root });
    } finally {
      writeOutput('ui-console.log', consoleLines.join('\n'));
      await page.context().close();
    }
  }
  await editor.stop();
  running.splice(running.indexOf(editor), 1);

  if (!parts.has('packaged')) return;
  step('packaged extension (.vsix)');
  const vsix = await tally.check(
    'npm run package writes out/ampnote.vsix',
    async () => {
      const p = spawnSync('npm', ['run', 'package'], { cwd: root, encoding: 'utf8' });
      const file = join(root, 'out', 'ampnote.vsix');
      if (p.status !== 0)
        throw new Error(`npm run package exited ${p.status}:\n${(p.stdout + p.stderr).slice(-3000)}`);
      if (!existsSync(file)) throw new Error('out/ampnote.vsix was not written');
      return file;
    },
    5 * 60_000,
  );
  if (!vsix) return;
  const packagedDir = join(RUN_DIR, 'packaged-extensions');
  rmSync(packagedDir, { recursive: true, force: true });
  const ok = await tally.check(
    'code-server --install-extension installs the .vsix into a fresh folder',
    async () => {
      installVsix(vsix, packagedDir);
      const listed = spawnSync('ls', [packagedDir], { encoding: 'utf8' }).stdout;
      if (!/ampnote\.ampnote-/.test(listed)) throw new Error(`extensions folder holds: ${listed}`);
    },
  );
  if (!ok) return;
  const packaged = await startEditor({
    profile: `run-${process.pid}-packaged`,
    fresh: true,
    extensionsDir: packagedDir,
    env: { AMPNOTE_EDITOR_SUITE: suite.config },
  });
  running.push(packaged);
  watchEditor(packaged, 'packaged');
  // Tests run only in a development window; a manifest-only extension opens one without shadowing the
  // installed package, which is what the smoke suite then exercises.
  suite.writeConfig('smoke');
  await hostSuite(
    browser,
    packaged,
    workspace,
    suite.entry,
    suite.results,
    testHostExtension(),
    'packaged host',
  );
  {
    const consoleLines = [];
    const page = await openWorkbench(browser, packaged.pageUrl({ folder: workspace }), { consoleLines });
    try {
      await smokeChecks({ page, tally, expected, output: OUTPUT, label: 'packaged' });
    } finally {
      writeOutput('packaged-console.log', consoleLines.join('\n'));
      await page.context().close();
    }
  }
}

/**
 * Keeps code-server's own output beside the screenshots, and says at once when it exits before the run
 * stops it (every check after that would fail for that one reason).
 */
function watchEditor(editor, label) {
  editor.process.once('exit', (code, signal) => {
    if (!editor.stopping) {
      console.log(
        `  !! code-server (${label}) exited on its own: ${signal ?? `exit ${code}`} at ${elapsed()} s`,
      );
      console.log(editor.output().slice(-2000).replace(/^/gm, '     | '));
    }
    writeOutput(`code-server-${label}.log`, `exit: ${signal ?? code}\n${editor.output()}`);
  });
}

function elapsed() {
  return ((Date.now() - started) / 1000).toFixed(1);
}

/** Loads the workbench with extensionTestsPath and counts each check the suite reports. */
async function hostSuite(browser, editor, workspace, suiteEntry, resultsFile, extensionPath, label) {
  let exitCode;
  const consoleLines = [];
  const page = await openWorkbench(
    browser,
    editor.pageUrl({
      folder: workspace,
      extensionDevelopmentPath: extensionPath,
      extensionTestsPath: suiteEntry,
    }),
    { onExit: (code) => (exitCode = code), consoleLines },
  );
  try {
    await poll('the extension-host suite to finish', () => exitCode, 5 * 60_000, 250).catch((err) =>
      tally.fail(`${label}: the extension-host suite finished`, err),
    );
    await screenshot(page, OUTPUT, `${label}-end`).catch(() => {});
  } finally {
    writeOutput(`${label}-console.log`, consoleLines.join('\n'));
    await page.context().close();
  }
  const results = existsSync(resultsFile) ? JSON.parse(readFileSync(resultsFile, 'utf8')) : [];
  for (const r of results) {
    if (r.ok) tally.pass(`${label}: ${r.name}`, r.ms);
    else tally.fail(`${label}: ${r.name}`, r.error);
  }
  if (results.length === 0) {
    const tail = consoleLines
      .filter((l) => !/gallery|marketplace/i.test(l))
      .slice(-30)
      .join('\n');
    tally.fail(
      `${label}: the extension-host suite reported its checks`,
      `no results (exit ${exitCode}); console:\n${tail}`,
    );
  } else if (exitCode !== undefined && (exitCode === 0) !== results.every((r) => r.ok)) {
    tally.fail(`${label}: the extension host's exit code agrees with the checks`, `exit ${exitCode}`);
  }
}

/** An extension with only a manifest: no code, no contributions. */
function testHostExtension() {
  const dir = join(RUN_DIR, 'test-host-extension');
  mkdirSync(dir, { recursive: true });
  const manifest = {
    name: 'ampnote-editor-tests-host',
    publisher: 'ampnote-tests',
    version: '0.0.0',
    description: 'Opens a development window so the suite can run against the installed package.',
    engines: { vscode: '^1.91.0' },
  };
  writeFileSync(join(dir, 'package.json'), JSON.stringify(manifest, null, 2));
  return dir;
}

/** True when a bundle is missing or any source file is newer than the oldest bundle. */
function buildIsStale() {
  const bundles = ['dist/client.js', 'dist/server.js', 'dist/cli.js'].map((f) => join(root, f));
  if (!bundles.every((f) => existsSync(f))) return true;
  const built = Math.min(...bundles.map((f) => statSync(f).mtimeMs));
  const newer = (dir) =>
    existsSync(dir) &&
    readdirSync(dir, { recursive: true }).some((f) => statSync(join(dir, String(f))).mtimeMs > built);
  return ['client/src', 'server/src', 'shared/src', 'package.json'].some((d) => {
    const p = join(root, d);
    return d.endsWith('.json') ? statSync(p).mtimeMs > built : newer(p);
  });
}

/** Writes a file into test-output/editor, which a run started meanwhile may have cleared. */
function writeOutput(name, text) {
  mkdirSync(OUTPUT, { recursive: true });
  writeFileSync(join(OUTPUT, name), text);
}

function countBy(items) {
  const out = {};
  for (const i of items) out[i] = (out[i] ?? 0) + 1;
  return out;
}

try {
  await main();
} catch (err) {
  tally.fail('editor tests ran to the end', err);
} finally {
  await stopAll();
  clearRunFolders({ mine: true });
  clearTimeout(watchdog);
  console.log(
    `\neditor tests took ${((Date.now() - started) / 1000).toFixed(1)} s; screenshots in test-output/editor/`,
  );
  console.log(`${tally.passed} passed, ${tally.failed} failed`);
  process.exitCode = tally.failed > 0 || tally.passed === 0 ? 1 : 0;
}
