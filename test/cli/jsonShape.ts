// The JSON shapes as docs/cli.md documents them: field paths read from its tables, and the paths a value has.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from './helpers';

/** Rows of the first table after the line that starts with `marker`: the backquoted paths of column one. */
export function documentedPaths(marker: string): string[] {
  const lines = readFileSync(join(ROOT, 'docs', 'cli.md'), 'utf8').split('\n');
  const start = lines.findIndex((l) => l.startsWith(marker));
  if (start < 0) throw new Error(`docs/cli.md has no line starting with ${marker}`);
  let i = start + 1;
  while (i < lines.length && !lines[i]!.startsWith('|')) i++;
  const paths: string[] = [];
  for (i += 2; i < lines.length && lines[i]!.startsWith('|'); i++) {
    const first = lines[i]!.split('|')[1]!;
    for (const m of first.matchAll(/`([^`]+)`/g)) paths.push(m[1]!);
  }
  return paths;
}

/**
 * Every path in a JSON value: `a.b` for fields, `a[]` for arrays (their elements' fields as `a[].x`).
 * Places (`range`, `location`) are one field each; their inner shape is checked separately.
 */
export function pathsOf(value: unknown, path = '', out = new Set<string>()): Set<string> {
  const last = path.split('.').pop();
  if (last === 'range' || last === 'location') {
    out.add(path);
    return out;
  }
  if (Array.isArray(value)) {
    out.add(`${path}[]`);
    for (const v of value) if (v !== null && typeof v === 'object') pathsOf(v, `${path}[]`, out);
    return out;
  }
  if (value !== null && typeof value === 'object') {
    if (path !== '' && !path.endsWith('[]')) out.add(path);
    for (const [k, v] of Object.entries(value)) pathsOf(v, path === '' ? k : `${path}.${k}`, out);
    return out;
  }
  out.add(path);
  return out;
}

/** A documented path matches an actual one; `*` stands for one field name, and null may stand for `x[]`. */
export function matches(documented: string, actual: string): boolean {
  const re = new RegExp(
    '^' +
      documented
        .split('*')
        .map((p) => p.replace(/[.[\]]/g, (c) => `\\${c}`))
        .join('[^.]+') +
      '$',
  );
  return re.test(actual) || (documented.endsWith('[]') && re.test(actual + '[]'));
}

/** Paths found under a finding list are compared with the finding table, without their prefix. */
export function splitFindings(
  paths: Iterable<string>,
  prefixes: readonly string[],
): { own: string[]; finding: string[] } {
  const own: string[] = [];
  const finding: string[] = [];
  for (const p of paths) {
    const prefix = prefixes.find((x) => p.startsWith(`${x}.`));
    if (prefix) finding.push(p.slice(prefix.length + 1));
    else own.push(p);
  }
  return { own, finding };
}
