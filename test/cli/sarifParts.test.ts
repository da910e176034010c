// The SARIF writer on its own: URIs of awkward paths, insertions as fixes, and schema validity of both.
import Ajv from 'ajv';
import addFormats from 'ajv-formats';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { sarifLog } from '../../cli/src/formatSarif';
import { analyzeDocument } from '../../shared/src/service';
import { FIXTURES, ROOT } from './helpers';

const schema = JSON.parse(
  readFileSync(join(ROOT, 'test', 'cli', 'vendor', 'sarif-schema-2.1.0.json'), 'utf8'),
);
const ajv = new Ajv({ allErrors: true, strict: false });
addFormats(ajv);
const validate = ajv.compile(schema);
const report = analyzeDocument(readFileSync(join(FIXTURES, 'marginal.ampnote'), 'utf8'));
// A working folder inside the checkout (never created: the writer only builds URIs from it).
const cwd = join(ROOT, 'test-output', 'sarif-space');
const ctx = { version: '9.9.9', cwd, docsUri: pathToFileURL(join(ROOT, 'docs', 'checks.md')).href };

describe('sarifLog', () => {
  it('percent-encodes paths relative to SRCROOT and uses absolute file URIs outside it', () => {
    const log = sarifLog(
      {
        files: [
          { path: 'my designs/a b#1.ampnote', report },
          { path: '../elsewhere/c.ampnote', report },
        ],
        problems: [{ path: 'gone dir', message: 'no such file or folder' }],
      },
      ctx,
    );
    expect(validate(log), JSON.stringify(validate.errors)).toBe(true);
    const run = log.runs[0]!;
    expect(run.originalUriBaseIds).toEqual({ SRCROOT: { uri: `${pathToFileURL(cwd).href}/` } });
    expect(run.artifacts!.map((a) => a.location)).toEqual([
      { uri: 'my%20designs/a%20b%231.ampnote', uriBaseId: 'SRCROOT' },
      { uri: pathToFileURL(join(ROOT, 'test-output', 'elsewhere', 'c.ampnote')).href },
    ]);
    expect(
      run.invocations![0]!.toolExecutionNotifications![0]!.locations![0]!.physicalLocation!.artifactLocation,
    ).toEqual({
      uri: 'gone%20dir',
      uriBaseId: 'SRCROOT',
    });
    expect(run.tool.driver.version).toBe('9.9.9');
  });

  it('writes an inserting fix as an empty deleted region at the insertion point', () => {
    const insert = report.findings
      .flatMap((f) => f.fixes)
      .flatMap((fix) => fix.edits)
      .find(
        (e) => e.range.start.line === e.range.end.line && e.range.start.character === e.range.end.character,
      );
    expect(insert, 'the fixture offers a fix that inserts text (adding rz)').toBeDefined();
    const log = sarifLog({ files: [{ path: 'a.ampnote', report }], problems: [] }, ctx);
    expect(validate(log), JSON.stringify(validate.errors)).toBe(true);
    const regions = log.runs[0]!.results!.flatMap((r) =>
      (r.fixes ?? []).flatMap((f) => f.artifactChanges[0]!.replacements),
    );
    const line = insert!.range.start.line + 1;
    const column = insert!.range.start.character + 1;
    expect(regions).toContainEqual({
      deletedRegion: { startLine: line, startColumn: column, endLine: line, endColumn: column },
      insertedContent: { text: insert!.newText },
    });
    expect(log.runs[0]!.invocations![0]).toMatchObject({ executionSuccessful: true, exitCode: 1 });
  });
});
