// Running the built checker as a user would: `node dist/cli.js …` in a child process.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

export const ROOT = resolve(__dirname, '../..');
export const CLI = join(ROOT, 'dist', 'cli.js');
export const FIXTURES = join(ROOT, 'test', 'cli', 'fixtures');

/** Newest modification time under a folder (source files the bundles are made from). */
function newest(dir: string): number {
  let t = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

/**
 * `npm run build` unless dist/cli.js (which carries the chart script for reports) and dist/charts.js are
 * newer than every source they bundle. Test files run in parallel workers, so the build runs under a lock
 * and the second worker finds it done.
 */
export function ensureBuilt(): void {
  const fresh = () => {
    if (!existsSync(CLI) || !existsSync(join(ROOT, 'dist', 'charts.js'))) return false;
    const built = Math.min(statSync(CLI).mtimeMs, statSync(join(ROOT, 'dist', 'charts.js')).mtimeMs);
    const sources = Math.max(
      newest(join(ROOT, 'shared', 'src')),
      newest(join(ROOT, 'cli', 'src')),
      newest(join(ROOT, 'client', 'src', 'webview')),
    );
    return built >= sources;
  };
  if (fresh()) return;
  execFileSync('flock', ['/tmp/ampnote-cli-test-build.lock', 'sh', '-c', 'npm run -s build'], {
    cwd: ROOT,
    stdio: 'pipe',
  });
}

export interface Run {
  readonly status: number | null;
  readonly stdout: string;
  readonly stderr: string;
}

export function cli(args: readonly string[], cwd: string = ROOT): Run {
  const r = spawnSync(process.execPath, [CLI, ...args], { cwd, encoding: 'utf8', timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

export function tempDir(prefix: string): { readonly path: string; readonly remove: () => void } {
  const path = mkdtempSync(join(tmpdir(), `ampnote-${prefix}-`));
  return { path, remove: () => rmSync(path, { recursive: true, force: true }) };
}
