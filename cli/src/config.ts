// The --config file: check thresholds with the editor settings' keys. Pure: the caller reads the file.
import {
  DEFAULT_CHECK_SETTINGS,
  resolveCheckSettings,
  settingProblem,
  type CheckSettings,
} from '../../shared/src/checks/settings';

export type ConfigResult =
  | { readonly ok: true; readonly settings: CheckSettings; readonly warnings: readonly string[] }
  | { readonly ok: false; readonly error: string };

const KEYS = Object.keys(DEFAULT_CHECK_SETTINGS) as readonly (keyof CheckSettings)[];
const PREFIX = 'ampnote.checks.';

/**
 * Accepted shapes (the first that is present wins):
 * - `{"ampnote.checks": {"phaseMargin": 45}}` or `{"ampnote": {"checks": {...}}}` — nested;
 * - `{"ampnote.checks.phaseMargin": 45}` — the editor's settings.json spelling, so that a workspace's
 *   settings file can be passed as it is;
 * - `{"phaseMargin": 45}` — flat.
 * Comments and trailing commas are allowed, as in the editor's settings files.
 */
export function parseConfig(text: string): ConfigResult {
  let root: unknown;
  try {
    root = JSON.parse(stripJsonComments(text));
  } catch (err) {
    return { ok: false, error: `not valid JSON (${err instanceof Error ? err.message : String(err)})` };
  }
  if (root === null || typeof root !== 'object' || Array.isArray(root)) {
    return { ok: false, error: 'expected a JSON object' };
  }
  const obj = root as Record<string, unknown>;
  const nested = obj['ampnote.checks'] ?? (obj['ampnote'] as Record<string, unknown> | undefined)?.['checks'];
  let section: Record<string, unknown>;
  let where: string;
  if (nested !== undefined) {
    if (nested === null || typeof nested !== 'object' || Array.isArray(nested)) {
      return { ok: false, error: `"ampnote.checks" must be an object` };
    }
    section = nested as Record<string, unknown>;
    where = 'ampnote.checks.';
  } else if (Object.keys(obj).some((k) => k.startsWith(PREFIX))) {
    section = {};
    for (const [k, v] of Object.entries(obj)) if (k.startsWith(PREFIX)) section[k.slice(PREFIX.length)] = v;
    where = PREFIX;
  } else {
    section = obj;
    where = '';
  }

  const warnings: string[] = [];
  for (const [key, value] of Object.entries(section)) {
    if (!(KEYS as readonly string[]).includes(key)) {
      // In a whole settings file, other extensions' keys are expected; only flag our own section's.
      if (where !== '' || !key.includes('.')) {
        warnings.push(`unknown setting "${where}${key}" ignored (known: ${KEYS.join(', ')})`);
      }
    } else {
      const problem = settingProblem(key as keyof CheckSettings, value);
      if (problem !== undefined) {
        warnings.push(
          `setting "${where}${key}" ${problem}; using the default ${DEFAULT_CHECK_SETTINGS[key as keyof CheckSettings]}`,
        );
      }
    }
  }
  return { ok: true, settings: resolveCheckSettings(section), warnings };
}

/** Removes // and /* *\/ comments outside strings, then commas before a closing bracket. */
export function stripJsonComments(text: string): string {
  const noComments = scan(text, (t, i) =>
    t[i] === '/' && (t[i + 1] === '/' || t[i + 1] === '*') ? 'comment' : 'keep',
  );
  const closing = /\s*[}\]]/y;
  return scan(noComments, (t, i) => {
    if (t[i] !== ',') return 'keep';
    closing.lastIndex = i + 1;
    return closing.test(t) ? 'drop' : 'keep';
  });
}

/** Walks the text outside strings; `decide` says what to do with each character there. */
function scan(text: string, decide: (text: string, i: number) => 'keep' | 'drop' | 'comment'): string {
  let out = '';
  let i = 0;
  while (i < text.length) {
    const c = text[i]!;
    if (c === '"') {
      let j = i + 1;
      while (j < text.length && text[j] !== '"') j += text[j] === '\\' ? 2 : 1;
      out += text.slice(i, j + 1);
      i = j + 1;
      continue;
    }
    const action = decide(text, i);
    if (action === 'comment') {
      if (text[i + 1] === '/') {
        while (i < text.length && text[i] !== '\n') i++;
      } else {
        const end = text.indexOf('*/', i + 2);
        i = end < 0 ? text.length : end + 2;
        out += ' ';
      }
    } else {
      if (action === 'keep') out += c;
      i++;
    }
  }
  return out;
}
