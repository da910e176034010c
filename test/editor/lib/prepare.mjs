// Shared by both routes (code-server and desktop VS Code): a scratch workspace holding copies of the
// examples, the checker's findings for them, and the bundled extension-host suite with its config file.
import { cpSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkerExpectations, exampleFiles } from './expectations.mjs';
import { bundleSuite } from './suiteBundle.mjs';

/** The workspace folder that holds the tests' own fixtures beside the examples. */
export const HAND_CHECKED = 'hand-checked';

/** Copies examples/ into `workDir`/examples (fresh each time): the checks edit and save files there. */
export function scratchWorkspace(root, workDir) {
  const workspace = join(workDir, 'examples');
  rmSync(workDir, { recursive: true, force: true });
  mkdirSync(workDir, { recursive: true });
  cpSync(join(root, 'examples'), workspace, { recursive: true });
  const examples = exampleFiles(workspace);
  if (examples.length === 0) throw new Error('examples/ has no .ampnote files');
  // The tests' own fixtures, whose values the suite also checks against closed forms.
  cpSync(join(root, 'test', 'editor', 'fixtures'), join(workspace, HAND_CHECKED), { recursive: true });
  const fixtures = exampleFiles(join(workspace, HAND_CHECKED)).map((f) => `${HAND_CHECKED}/${f}`);
  return { workspace, files: [...examples, ...fixtures] };
}

export function expectationsFor(root, workspace, files) {
  return checkerExpectations(root, workspace, files);
}

/** Bundles the suite into `suiteDir` and returns a writer for its config (mode: full | smoke). */
export async function suiteFiles(root, suiteDir, workspace, expected) {
  const entry = await bundleSuite(root, suiteDir);
  const results = join(suiteDir, 'results.json');
  const config = join(suiteDir, 'config.json');
  const writeConfig = (mode) => {
    rmSync(results, { force: true });
    writeFileSync(config, JSON.stringify({ mode, workspace, results, expected }, null, 2));
  };
  return { entry, results, config, writeConfig };
}
