// A real VS Code (the browser build served by code-server) installed into .cache/editor and started on
// loopback with this extension and the examples. Used by `npm start` and by the editor tests.
//
// CLI: node scripts/editor.mjs install        install into the cache (or report what is missing)
//      node scripts/editor.mjs start          start with the extension under development, print the URL
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, writeFileSync, readFileSync, rmSync, copyFileSync, cpSync } from 'node:fs';
import { createServer } from 'node:net';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export const CODE_SERVER_VERSION = '4.100.3';
/** The ripgrep release the bundled search package expects to find in its download cache. */
const RIPGREP_CACHE = 'vscode-ripgrep-cache-1.15.11';
const RIPGREP_TARBALL = 'ripgrep-v13.0.0-10-x86_64-unknown-linux-musl.tar.gz';
const APT_PACKAGES = ['chromium', 'fonts-liberation', 'libkrb5-dev', 'pkg-config', 'ripgrep'];

export const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const cacheDir = join(root, '.cache');
export const editorDir = join(cacheDir, 'editor');
const codeServerBin = join(editorDir, 'node_modules', 'code-server', 'out', 'node', 'entry.js');
const codeServerPkg = join(editorDir, 'node_modules', 'code-server', 'package.json');

/** Environment that keeps code-server's and npm's writes inside the cache, never in the home folder. */
export function editorEnv(extra = {}) {
  const config = join(editorDir, 'xdg', 'config');
  const data = join(editorDir, 'xdg', 'data');
  for (const d of [config, data]) mkdirSync(d, { recursive: true });
  return { ...process.env, XDG_CONFIG_HOME: config, XDG_DATA_HOME: data, ...extra };
}

/**
 * The install also gets a TMPDIR of its own, where the search package looks for its download cache.
 * (The running editor keeps the system's: its IPC socket paths must stay short.)
 */
function installEnv() {
  const tmp = join(editorDir, 'tmp');
  mkdirSync(tmp, { recursive: true });
  return editorEnv({
    TMPDIR: tmp,
    npm_config_yes: 'true',
    npm_config_fund: 'false',
    npm_config_audit: 'false',
  });
}

/**
 * What this script cannot provide itself; empty when all is there. `install`: what the npm install of
 * code-server needs (not needed once it is in the cache); `browser`: Chromium for the UI tests.
 */
export function missingPrerequisites({
  install = installedVersion() !== CODE_SERVER_VERSION,
  browser = true,
} = {}) {
  const missing = [];
  const debian = existsSync('/etc/debian_version');
  if (!debian)
    missing.push(
      'a Debian (or Debian-based) system: the install uses Debian packages for the browser and ripgrep',
    );
  if (process.arch !== 'x64') missing.push(`an x86_64 machine (this is ${process.arch})`);
  const [major] = process.versions.node.split('.').map(Number);
  if (major !== 20)
    missing.push(
      `Node.js 20 (this is ${process.versions.node}; code-server ${CODE_SERVER_VERSION} is built for 20)`,
    );
  const apt = [];
  if (install && !existsSync('/usr/bin/rg')) apt.push('ripgrep');
  if (browser && !existsSync('/usr/bin/chromium')) apt.push('chromium', 'fonts-liberation');
  if (install && !existsSync('/usr/include/krb5.h') && !existsSync('/usr/include/krb5/krb5.h'))
    apt.push('libkrb5-dev');
  if (install && !existsSync('/usr/bin/pkg-config') && !existsSync('/usr/bin/pkgconf'))
    apt.push('pkg-config');
  if (apt.length > 0) {
    const root = typeof process.getuid === 'function' && process.getuid() === 0;
    missing.push(
      `Debian packages: ${apt.join(' ')} — install with: ${root ? '' : 'sudo '}apt-get update && ${root ? '' : 'sudo '}apt-get install -y --no-install-recommends ${APT_PACKAGES.join(' ')}`,
    );
  }
  return missing;
}

/** Written only after an install finished, so an interrupted one is never taken for a working editor. */
const installedMarker = join(editorDir, 'installed.json');

function packageVersion() {
  try {
    return JSON.parse(readFileSync(codeServerPkg, 'utf8')).version;
  } catch {
    return undefined;
  }
}

export function installedVersion() {
  if (!existsSync(codeServerBin) || !existsSync(codeServerPkg) || !existsSync(installedMarker))
    return undefined;
  try {
    return JSON.parse(readFileSync(installedMarker, 'utf8')).version;
  } catch {
    return undefined;
  }
}

/**
 * Runs `fn` holding the cache's install lock, so that runs started at the same time (several people in
 * one tree, say) never install over each other. A lock whose owner has exited is taken over.
 */
async function withInstallLock(fn, log) {
  const lock = join(cacheDir, 'editor-install.lock');
  mkdirSync(cacheDir, { recursive: true });
  const deadline = Date.now() + 20 * 60_000;
  let told = false;
  for (;;) {
    try {
      mkdirSync(lock);
      break;
    } catch (err) {
      if (err.code !== 'EEXIST') throw err;
    }
    let owner;
    try {
      owner = Number(readFileSync(join(lock, 'pid'), 'utf8'));
    } catch {
      // just created, its owner has not written its pid yet
    }
    if (owner && !isAlive(owner)) {
      rmSync(lock, { recursive: true, force: true });
      continue;
    }
    if (Date.now() > deadline) throw new Error(`Another install still holds ${lock}.`);
    if (!told) log(`Waiting for another install of the editor to finish (${lock})…`);
    told = true;
    await delay(1000);
  }
  writeFileSync(join(lock, 'pid'), String(process.pid));
  try {
    return await fn();
  } finally {
    rmSync(lock, { recursive: true, force: true });
  }
}

export function isAlive(pid) {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return err.code === 'EPERM';
  }
}

/**
 * Installs code-server into .cache/editor unless the right version is already there.
 * Throws an Error whose message lists what is missing when the install cannot work here.
 */
export async function installEditor({ log = (s) => console.log(s) } = {}) {
  if (installedVersion() === CODE_SERVER_VERSION) return { reused: true };
  return withInstallLock(async () => {
    if (installedVersion() === CODE_SERVER_VERSION) return { reused: true };
    return installNow(log);
  }, log);
}

function installNow(log) {
  const missing = missingPrerequisites({ install: true, browser: false });
  if (missing.length > 0) {
    throw new Error(
      `Cannot install the editor for tests and the demo. Missing:\n  - ${missing.join('\n  - ')}`,
    );
  }
  mkdirSync(editorDir, { recursive: true });
  const env = installEnv();
  // The search package's postinstall downloads ripgrep; hand it Debian's binary through its own cache.
  const rgCache = join(env.TMPDIR, RIPGREP_CACHE);
  mkdirSync(rgCache, { recursive: true });
  const stage = join(env.TMPDIR, 'rg-stage');
  mkdirSync(stage, { recursive: true });
  copyFileSync('/usr/bin/rg', join(stage, 'rg'));
  const tar = spawnSync('tar', ['-czf', join(rgCache, RIPGREP_TARBALL), '-C', stage, 'rg'], {
    stdio: 'inherit',
  });
  if (tar.status !== 0) throw new Error('Could not pack /usr/bin/rg for the editor install (tar failed).');
  writeFileSync(
    join(editorDir, 'package.json'),
    JSON.stringify(
      {
        name: 'ampnote-editor-cache',
        private: true,
        description:
          'The browser build of VS Code used by the editor tests and the demo; not part of the extension.',
        dependencies: { 'code-server': CODE_SERVER_VERSION },
      },
      null,
      2,
    ) + '\n',
  );
  log(`Installing code-server ${CODE_SERVER_VERSION} into ${editorDir} (a few minutes, once)…`);
  const started = Date.now();
  const npm = spawnSync('npm', ['install', '--unsafe-perm', '--no-package-lock', '--loglevel=error'], {
    cwd: editorDir,
    env,
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  if (npm.status !== 0 || packageVersion() !== CODE_SERVER_VERSION || !existsSync(codeServerBin)) {
    throw new Error(
      `npm install of code-server ${CODE_SERVER_VERSION} failed (exit ${npm.status}). ` +
        `It needs the npm registry, Node.js 20 headers for native modules, and the Debian packages ${APT_PACKAGES.join(' ')}.`,
    );
  }
  writeFileSync(
    installedMarker,
    JSON.stringify({
      version: CODE_SERVER_VERSION,
      node: process.versions.node,
      at: new Date().toISOString(),
    }) + '\n',
  );
  log(`code-server installed in ${Math.round((Date.now() - started) / 1000)} s.`);
  return { reused: false };
}

export function freePort() {
  return new Promise((resolvePort, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address();
      srv.close(() => resolvePort(port));
    });
  });
}

/** Settings that keep the editor quiet: no welcome page, tips, notifications about updates or trust. */
export const QUIET_SETTINGS = {
  'workbench.startupEditor': 'none',
  'workbench.tips.enabled': false,
  'workbench.welcomePage.walkthroughs.openOnInstall': false,
  'workbench.enableExperiments': false,
  'security.workspace.trust.enabled': false,
  'telemetry.telemetryLevel': 'off',
  'update.mode': 'none',
  'extensions.autoCheckUpdates': false,
  'extensions.autoUpdate': false,
  'extensions.ignoreRecommendations': true,
  'git.enabled': false,
  'chat.commandCenter.enabled': false,
  'workbench.secondarySideBar.defaultVisibility': 'hidden',
  'editor.minimap.enabled': false,
  'editor.hover.delay': 150,
  'window.commandCenter': false,
};

/**
 * Starts code-server on a free loopback port. Resolves when /healthz answers.
 * `profile` names a folder under .cache/editor/profiles holding user data and extensions.
 */
export async function startEditor({
  profile = 'dev',
  fresh = false,
  extensionsDir,
  settings = {},
  env = {},
  log = () => {},
  timeoutMs = 60_000,
} = {}) {
  await installEditor({ log });
  const base = join(editorDir, 'profiles', profile);
  if (fresh) rmSync(base, { recursive: true, force: true });
  const userData = join(base, 'user-data');
  const extDir = extensionsDir ?? join(base, 'extensions');
  mkdirSync(join(userData, 'User'), { recursive: true });
  mkdirSync(extDir, { recursive: true });
  writeSettings(join(userData, 'User', 'settings.json'), { ...QUIET_SETTINGS, ...settings });
  const port = await freePort();
  const args = [
    codeServerBin,
    '--bind-addr',
    `127.0.0.1:${port}`,
    '--auth',
    'none',
    '--disable-telemetry',
    '--disable-update-check',
    '--disable-workspace-trust',
    '--disable-getting-started-override',
    '--user-data-dir',
    userData,
    '--extensions-dir',
    extDir,
    '--ignore-last-opened',
  ];
  const child = spawn(process.execPath, args, {
    cwd: root,
    env: editorEnv(env),
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  });
  let output = '';
  const keep = (chunk) => {
    output += chunk.toString();
    if (output.length > 200_000) output = output.slice(-100_000);
  };
  child.stdout.on('data', keep);
  child.stderr.on('data', keep);
  const exited = new Promise((r) => child.once('exit', (code, signal) => r({ code, signal })));
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + timeoutMs;
  let ready = false;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null) break;
    try {
      const res = await fetch(`${url}/healthz`);
      if (res.ok) {
        ready = true;
        break;
      }
    } catch {
      // not listening yet
    }
    await Promise.race([delay(150), exited]);
  }
  const editor = {
    url,
    port,
    userData,
    extensionsDir: extDir,
    process: child,
    output: () => output,
    /** The page that opens `folder` with the given development payload entries. */
    pageUrl({ folder, extensionDevelopmentPath, extensionTestsPath } = {}) {
      const payload = [];
      if (extensionDevelopmentPath)
        payload.push(['extensionDevelopmentPath', remoteUri(port, extensionDevelopmentPath)]);
      if (extensionTestsPath) payload.push(['extensionTestsPath', remoteUri(port, extensionTestsPath)]);
      const q = new URLSearchParams();
      if (folder) q.set('folder', folder);
      if (payload.length > 0) q.set('payload', JSON.stringify(payload));
      return `${url}/?${q.toString().replace(/\+/g, '%20')}`;
    },
    /** Stops code-server and every process it started (extension hosts, language servers). */
    /** Set once stop() is called: an exit before that is the editor dying on its own. */
    stopping: false,
    async stop() {
      editor.stopping = true;
      if (child.exitCode !== null || child.signalCode !== null) return;
      killGroup(child.pid, 'SIGTERM');
      const done = await Promise.race([exited.then(() => true), delay(5000).then(() => false)]);
      if (!done) {
        killGroup(child.pid, 'SIGKILL');
        await Promise.race([exited, delay(2000)]);
      }
      // Extension hosts may outlive the main process for a moment; the group kill reaches them too.
      killGroup(child.pid, 'SIGKILL');
    },
  };
  if (!ready) {
    await editor.stop();
    throw new Error(
      `code-server did not become ready on ${url} within ${timeoutMs / 1000} s.\n${output.slice(-4000)}`,
    );
  }
  return editor;
}

/**
 * Writes the quiet defaults under whatever the user has set in this profile: their own values win, and a
 * file that cannot be read as plain JSON (comments, say) is left exactly as they wrote it.
 */
function writeSettings(file, defaults) {
  let current = {};
  if (existsSync(file)) {
    try {
      current = JSON.parse(readFileSync(file, 'utf8'));
    } catch {
      return;
    }
    if (!current || typeof current !== 'object' || Array.isArray(current)) return;
  }
  const merged = { ...defaults, ...current };
  if (existsSync(file) && JSON.stringify(merged) === JSON.stringify(current)) return;
  writeFileSync(file, JSON.stringify(merged, null, 2) + '\n');
}

export function remoteUri(port, absPath) {
  return `vscode-remote://127.0.0.1:${port}${pathToFileURL(absPath).pathname}`;
}

/** Installs a packaged extension (.vsix) into an extensions folder with code-server's own installer. */
export function installVsix(vsixPath, extensionsDir, { userData } = {}) {
  mkdirSync(extensionsDir, { recursive: true });
  const args = [codeServerBin, '--extensions-dir', extensionsDir, '--install-extension', vsixPath, '--force'];
  if (userData) args.push('--user-data-dir', userData);
  const r = spawnSync(process.execPath, args, {
    cwd: root,
    env: editorEnv(),
    encoding: 'utf8',
    timeout: 120_000,
  });
  if (r.status !== 0)
    throw new Error(`Installing ${vsixPath} failed (exit ${r.status}):\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

/** Copies an unpacked extension folder into an extensions folder (folder installs are not supported). */
export function copyExtensionFolder(from, extensionsDir, name) {
  const to = join(extensionsDir, name);
  rmSync(to, { recursive: true, force: true });
  cpSync(from, to, { recursive: true });
  return to;
}

function killGroup(pid, signal) {
  try {
    process.kill(-pid, signal);
  } catch {
    // already gone
  }
}

function delay(ms) {
  return new Promise((r) => setTimeout(r, ms));
}

async function main() {
  const [cmd = 'start'] = process.argv.slice(2);
  try {
    if (cmd === 'install') {
      const { reused } = await installEditor();
      console.log(reused ? `code-server ${CODE_SERVER_VERSION} already installed in ${editorDir}.` : 'Done.');
      return;
    }
    if (cmd === 'check') {
      const missing = missingPrerequisites();
      console.log(
        missing.length === 0 ? 'All prerequisites present.' : `Missing:\n  - ${missing.join('\n  - ')}`,
      );
      process.exitCode = missing.length === 0 ? 0 : 1;
      return;
    }
    if (cmd === 'start') {
      const editor = await startEditor({ log: (s) => console.log(s) });
      const url = editor.pageUrl({ folder: join(root, 'examples'), extensionDevelopmentPath: root });
      console.log(`\nThe editor is ready. Open:\n\n  ${url}\n\nCtrl+C stops it.`);
      const stop = async () => {
        await editor.stop();
        process.exit(0);
      };
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
      await new Promise((r) => editor.process.once('exit', r));
      console.log('code-server stopped.');
      return;
    }
    console.error(`Unknown command "${cmd}". Use: install | check | start`);
    process.exitCode = 2;
  } catch (err) {
    console.error(err instanceof Error ? err.message : String(err));
    process.exitCode = 1;
  }
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) await main();
