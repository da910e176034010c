// Which files a `check` run reads: named files as given, folders searched for *.ampnote.
import { readdirSync, statSync, type Dirent } from 'node:fs';
import { join, resolve } from 'node:path';

export const EXTENSION = '.ampnote';

export interface InputProblem {
  /** The path as the user wrote it (or the file found under a folder). */
  readonly path: string;
  readonly message: string;
}

export interface Discovery {
  /** Absolute paths, each once, in the order given (folder contents sorted by name). */
  readonly files: readonly string[];
  readonly problems: readonly InputProblem[];
}

/**
 * A file named on the command line is checked whatever its extension (the user asked for it); a folder
 * contributes its *.ampnote files, recursively, skipping node_modules and dot-folders. Symbolic links to
 * folders are not followed, so a link cycle cannot make the walk endless.
 */
export function discoverFiles(paths: readonly string[], cwd: string): Discovery {
  const files: string[] = [];
  const seen = new Set<string>();
  const problems: InputProblem[] = [];
  const add = (file: string) => {
    if (!seen.has(file)) {
      seen.add(file);
      files.push(file);
    }
  };

  for (const given of paths) {
    const abs = resolve(cwd, given);
    let isDir: boolean;
    try {
      const st = statSync(abs);
      isDir = st.isDirectory();
      if (!isDir && !st.isFile()) {
        problems.push({ path: given, message: 'not a regular file or folder' });
        continue;
      }
    } catch (err) {
      problems.push({ path: given, message: describeFsError(err) });
      continue;
    }
    if (!isDir) {
      add(abs);
      continue;
    }
    const found: string[] = [];
    walk(abs, found, problems, given);
    if (found.length === 0) {
      problems.push({ path: given, message: `folder holds no ${EXTENSION} files` });
    }
    for (const f of found) add(f);
  }
  return { files, problems };
}

function walk(dir: string, out: string[], problems: InputProblem[], shown: string): void {
  let entries: Dirent[];
  try {
    entries = readdirSync(dir, { withFileTypes: true });
  } catch (err) {
    problems.push({ path: shown, message: describeFsError(err) });
    return;
  }
  entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  for (const e of entries) {
    const full = join(dir, e.name);
    if (e.isDirectory()) {
      if (e.name === 'node_modules' || e.name.startsWith('.')) continue;
      walk(full, out, problems, join(shown, e.name));
    } else if (e.name.endsWith(EXTENSION) && (e.isFile() || (e.isSymbolicLink() && isFile(full)))) {
      out.push(full);
    }
  }
}

function isFile(path: string): boolean {
  try {
    return statSync(path).isFile();
  } catch {
    return false;
  }
}

/** `ENOENT` → `no such file or folder`: the message a person needs, not the errno. */
export function describeFsError(err: unknown): string {
  const code = (err as { code?: string } | null)?.code;
  switch (code) {
    case 'ENOENT':
      return 'no such file or folder';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'EISDIR':
      return 'is a folder, not a file';
    case 'ENOTDIR':
      return 'a part of the path is not a folder';
    case 'ELOOP':
      return 'too many symbolic links';
    default:
      return err instanceof Error ? err.message : String(err);
  }
}
