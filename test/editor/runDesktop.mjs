// The same extension-host suite in desktop VS Code, through @vscode/test-electron.
//
//   VSCODE_EXECUTABLE_PATH=/path/to/code node test/editor/runDesktop.mjs
//   AMPNOTE_VSCODE_DOWNLOAD=stable node test/editor/runDesktop.mjs   (where the network allows a download)
//
// Prints `N passed, N failed` last and exits non-zero on any failure.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { runTests } from '@vscode/test-electron';
import { cacheDir, QUIET_SETTINGS, root } from '../../scripts/editor.mjs';
import { expectationsFor, scratchWorkspace, suiteFiles } from './lib/prepare.mjs';
import { Tally } from './lib/tally.mjs';

const tally = new Tally();
const desktopDir = join(cacheDir, 'desktop');

async function main() {
  const executable = process.env.VSCODE_EXECUTABLE_PATH;
  const download = process.env.AMPNOTE_VSCODE_DOWNLOAD;
  if (!executable && !download) {
    throw new Error(
      'No desktop VS Code to run: set VSCODE_EXECUTABLE_PATH to a VS Code executable, or ' +
        'AMPNOTE_VSCODE_DOWNLOAD=stable (or a version) where the network allows test-electron to download one.',
    );
  }
  if (executable && !existsSync(executable))
    throw new Error(`VSCODE_EXECUTABLE_PATH=${executable} does not exist`);

  if (!['dist/client.js', 'dist/server.js', 'dist/cli.js'].every((f) => existsSync(join(root, f)))) {
    if (spawnSync('npm', ['run', 'build'], { cwd: root, stdio: 'inherit' }).status !== 0) {
      throw new Error('npm run build failed');
    }
  }
  const { workspace, files } = scratchWorkspace(root, join(desktopDir, 'work'));
  const expected = expectationsFor(root, workspace, files);
  const suite = await suiteFiles(root, join(desktopDir, 'suite'), workspace, expected);
  suite.writeConfig('full');

  const userData = join(desktopDir, 'user-data');
  mkdirSync(join(userData, 'User'), { recursive: true });
  writeFileSync(join(userData, 'User', 'settings.json'), JSON.stringify(QUIET_SETTINGS, null, 2));

  let failure;
  try {
    await runTests({
      ...(executable
        ? { vscodeExecutablePath: executable }
        : { version: download, cachePath: join(desktopDir, 'builds') }),
      extensionDevelopmentPath: root,
      extensionTestsPath: suite.entry,
      extensionTestsEnv: { AMPNOTE_EDITOR_SUITE: suite.config },
      launchArgs: [
        workspace,
        '--user-data-dir',
        userData,
        '--extensions-dir',
        join(desktopDir, 'extensions'),
        '--disable-workspace-trust',
        '--skip-welcome',
        '--skip-release-notes',
        '--disable-updates',
      ],
    });
  } catch (err) {
    failure = err;
  }
  const results = existsSync(suite.results) ? JSON.parse(readFileSync(suite.results, 'utf8')) : [];
  for (const r of results) {
    if (r.ok) tally.pass(`desktop: ${r.name}`, r.ms);
    else tally.fail(`desktop: ${r.name}`, r.error);
  }
  if (results.length === 0)
    tally.fail('desktop: the extension-host suite reported its checks', failure ?? 'no results');
  else if (failure && results.every((r) => r.ok)) tally.fail('desktop: VS Code exited cleanly', failure);
}

try {
  await main();
} catch (err) {
  tally.fail('desktop editor tests ran', err);
} finally {
  console.log(`${tally.passed} passed, ${tally.failed} failed`);
  process.exitCode = tally.failed > 0 || tally.passed === 0 ? 1 : 0;
}
