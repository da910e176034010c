// Builds the bundles and packs the extension into out/ampnote.vsix (offline: no dependency scan, since the
// bundles carry their dependencies). Prints the package's file list so a reviewer sees what ships.
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const vsce = join(root, 'node_modules', '@vscode', 'vsce', 'vsce');
const out = join('out', 'ampnote.vsix');

function run(cmd, args) {
  try {
    execFileSync(cmd, args, { cwd: root, stdio: 'inherit' });
  } catch (err) {
    console.error(`package: \`${[cmd, ...args].join(' ')}\` failed (exit ${err.status ?? err.signal}).`);
    process.exit(1);
  }
}

run(process.platform === 'win32' ? 'npm.cmd' : 'npm', ['run', 'build']);
for (const bundle of ['dist/client.js', 'dist/server.js', 'client/media/panel.js']) {
  if (!existsSync(join(root, bundle))) {
    console.error(`package: ${bundle} was not built; fix the build first.`);
    process.exit(1);
  }
}
mkdirSync(join(root, 'out'), { recursive: true });
// A failed run must not leave an older package behind that looks like this one.
rmSync(join(root, out), { force: true });
// The package is installed from a file, not published: no repository to point the README's relative links
// at, so they stay relative.
run(process.execPath, [
  vsce,
  'package',
  '--no-dependencies',
  '--allow-missing-repository',
  '--no-rewrite-relative-links',
  '--out',
  out,
]);
console.log(`\nContents of ${out}:`);
run(process.execPath, [vsce, 'ls', '--no-dependencies']);
