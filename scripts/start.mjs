// `npm start`: build, show the terminal checker's findings for the examples, then open the examples in a
// real VS Code (the browser build, on this machine only) with the extension loaded. Ctrl+C stops it.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { root, startEditor } from './editor.mjs';

function run(cmd, args) {
  return spawnSync(cmd, args, { cwd: root, stdio: 'inherit' }).status;
}

console.log('Building…');
if (run('npm', ['run', 'build']) !== 0) {
  console.error('The build failed; see the messages above.');
  process.exit(1);
}

const cli = join(root, 'dist', 'cli.js');
if (existsSync(cli)) {
  console.log('\nThe terminal checker on examples/:\n');
  // Findings make the checker exit non-zero; that is its answer, not a failure of this script.
  run(process.execPath, [cli, 'check', 'examples']);
} else {
  console.log('\ndist/cli.js is missing (the terminal checker is not built yet); going on to the editor.');
}

console.log('\nStarting the editor (the first start installs it into .cache/editor, a few minutes)…');
let editor;
try {
  editor = await startEditor({ profile: 'start', log: (s) => console.log(s) });
} catch (err) {
  console.error(err instanceof Error ? err.message : String(err));
  process.exit(1);
}

const url = editor.pageUrl({ folder: join(root, 'examples'), extensionDevelopmentPath: root });
console.log(`\nReady. Open this address in a browser on this machine:\n\n  ${url}\n`);
console.log('Open an .ampnote file to see diagnostics; "Ampnote" commands are in the command palette.');
console.log('Ctrl+C stops the editor.');

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  console.log('\nStopping the editor…');
  await editor.stop();
  console.log('Stopped.');
  process.exit(0);
}
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
editor.process.once('exit', (code, signal) => {
  if (stopping) return;
  console.error(
    `code-server exited on its own (${signal ?? `exit ${code}`}).\n${editor.output().slice(-3000)}`,
  );
  process.exit(1);
});
