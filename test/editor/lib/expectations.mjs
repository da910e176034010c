// What the editor must show for each example, taken from the terminal checker's JSON (the same engine
// reached through another route: the editor and the checker must agree finding for finding).
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import { join, relative } from 'node:path';

export function exampleFiles(dir) {
  return readdirSync(dir)
    .filter((f) => f.endsWith('.ampnote'))
    .sort();
}

/**
 * Runs `node dist/cli.js check --format json <files>` in `workspace` (paths relative to it) and returns
 * one entry per file.
 * Throws with the checker's own output when it cannot be run or read.
 */
export function checkerExpectations(root, workspace, files) {
  const cli = join(root, 'dist', 'cli.js');
  if (!existsSync(cli)) throw new Error('dist/cli.js is missing: the terminal checker has not been built');
  const r = spawnSync(process.execPath, [cli, 'check', '--format', 'json', ...files], {
    cwd: workspace,
    encoding: 'utf8',
    timeout: 60_000,
  });
  // Exit 1 means "findings at or above the failing severity", which the examples are meant to have.
  if (r.status !== 0 && r.status !== 1) {
    throw new Error(`ampnote check exited ${r.status}:\n${r.stderr || r.stdout}`);
  }
  let json;
  try {
    json = JSON.parse(r.stdout);
  } catch {
    throw new Error(`ampnote check --format json printed no JSON:\n${r.stdout.slice(0, 2000)}`);
  }
  return files.map((file) => ({
    file,
    source: 'ampnote check --format json',
    ...fromReport(json, file, workspace),
    designs: designsOf(cli, workspace, file),
  }));
}

/** Each design's place, nominal poles and loop figures from `ampnote analyze FILE --json`. */
function designsOf(cli, workspace, file) {
  const r = spawnSync(process.execPath, [cli, 'analyze', file, '--json', '--quiet'], {
    cwd: workspace,
    encoding: 'utf8',
    timeout: 60_000,
  });
  let json;
  try {
    json = JSON.parse(r.stdout);
  } catch {
    throw new Error(
      `ampnote analyze ${file} --json printed no JSON (exit ${r.status}):\n${(r.stderr || r.stdout).slice(0, 2000)}`,
    );
  }
  return (json.designs ?? []).map((d) => {
    const nominal = d.corners?.[0];
    return {
      name: d.name,
      range: d.range,
      polesHz: (nominal?.poles ?? []).map((p) => p.hz).filter((hz) => typeof hz === 'number'),
      phaseMarginDeg: {
        nominal: nominal?.loop?.phaseMarginDeg ?? null,
        worst: d.worst?.phaseMarginDeg?.value ?? null,
      },
      ugfHz: { nominal: nominal?.loop?.ugfHz ?? null, worst: d.worst?.ugfHz?.value ?? null },
    };
  });
}

/** Findings (and pole frequencies per Miller line, when reported) of one file in the checker's JSON. */
function fromReport(json, file, workspace) {
  const entries = Array.isArray(json?.files) ? json.files : Array.isArray(json) ? json : [];
  const entry = entries.find((e) => {
    const p = e.file ?? e.path ?? e.uri ?? '';
    return p === file || p.endsWith(`/${file}`) || relative(workspace, p) === file;
  });
  if (!entry) throw new Error(`ampnote check JSON has no entry for ${file}`);
  const findings = (entry.findings ?? []).map((f) => ({
    code: f.code,
    severity: f.severity,
    range: f.range,
    message: f.message,
    fixes: (f.fixes ?? []).map((x) => ({ title: x.title, preferred: x.preferred === true })),
  }));
  return { findings };
}
