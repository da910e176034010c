// `check --format sarif`: a SARIF 2.1.0 log, for code-scanning services and review tools.
import { isAbsolute, relative, resolve, sep } from 'node:path';
import { pathToFileURL } from 'node:url';
import type * as Sarif from 'sarif';
import { CHECK_CODES, type Finding, type Severity } from '../../shared/src/checks/types';
import type { SourceRange } from '../../shared/src/language/source';
import { CAUTION } from '../../shared/src/protocol/panelData';
import { RULES } from './rules';
import { exitCodeOf, oneBased, sortedFindings, summarize, type RunResult } from './run';

export interface SarifContext {
  readonly version: string;
  /** The working folder: paths in the log are relative to it (base id SRCROOT). */
  readonly cwd: string;
  /** URI of the checks documentation; each rule's help link is this plus `#<code>`. */
  readonly docsUri: string;
}

const LEVEL: Record<Severity, Sarif.Result.level> = { error: 'error', warning: 'warning', info: 'note' };

export function sarifLog(run: RunResult, ctx: SarifContext): Sarif.Log {
  const rootUri = pathToFileURL(ctx.cwd.endsWith(sep) ? ctx.cwd : ctx.cwd + sep).href;
  const artifactUri = (path: string) => artifactLocation(path, ctx.cwd);
  const rules: Sarif.ReportingDescriptor[] = CHECK_CODES.map((code) => {
    const info = RULES[code];
    return {
      id: code,
      name: info.name,
      shortDescription: { text: info.short },
      fullDescription: { text: info.help },
      help: { text: info.help, markdown: `${info.help}\n\nSee [${code}](${ctx.docsUri}#${code}).` },
      helpUri: `${ctx.docsUri}#${code}`,
    };
  });
  const ruleIndex = new Map<string, number>(CHECK_CODES.map((c, i) => [c, i]));

  const artifacts: Sarif.Artifact[] = [];
  const results: Sarif.Result[] = [];
  for (const file of run.files) {
    const index = artifacts.length;
    const location = { ...artifactUri(file.path), index };
    artifacts.push({ location: artifactUri(file.path), roles: ['analysisTarget'], mimeType: 'text/plain' });
    for (const f of sortedFindings(file.report.findings)) results.push(result(f, location, ruleIndex));
  }

  const summary = summarize(run);
  const notifications: Sarif.Notification[] = run.problems.map((p) => ({
    level: 'error',
    message: { text: `${p.path}: ${p.message}` },
    locations: [{ physicalLocation: { artifactLocation: artifactUri(p.path) } }],
  }));

  return {
    $schema: 'https://json.schemastore.org/sarif-2.1.0.json',
    version: '2.1.0',
    runs: [
      {
        tool: {
          driver: {
            name: 'ampnote',
            version: ctx.version,
            semanticVersion: ctx.version,
            informationUri: ctx.docsUri,
            rules,
          },
        },
        invocations: [
          {
            executionSuccessful: run.problems.length === 0,
            exitCode: exitCodeOf(summary),
            toolExecutionNotifications: notifications,
          },
        ],
        originalUriBaseIds: { SRCROOT: { uri: rootUri } },
        columnKind: 'utf16CodeUnits',
        artifacts,
        results,
        // SARIF 2.1.0 §3.8: a property bag carries what the format has no field for.
        properties: { caution: CAUTION },
      },
    ],
  };
}

function result(f: Finding, location: Sarif.ArtifactLocation, ruleIndex: Map<string, number>): Sarif.Result {
  const phys = (range: SourceRange): Sarif.PhysicalLocation => ({
    artifactLocation: location,
    region: region(range),
  });
  const out: Sarif.Result = {
    ruleId: f.code,
    ruleIndex: ruleIndex.get(f.code),
    level: LEVEL[f.severity],
    message: { text: f.message },
    locations: [{ physicalLocation: phys(f.range) }],
    properties: {
      ...(f.design !== undefined ? { design: f.design } : {}),
      ...(f.corners && f.corners.length > 0 ? { corners: [...f.corners] } : {}),
    },
  };
  if (f.related.length > 0) {
    out.relatedLocations = f.related.map((r, id) => ({
      id,
      physicalLocation: phys(r.range),
      message: { text: r.message },
    }));
  }
  const offered = f.fixes.filter((fix) => fix.disabled === undefined);
  if (offered.length > 0) {
    out.fixes = offered.map((fix) => ({
      description: { text: fix.title },
      artifactChanges: [
        {
          artifactLocation: location,
          replacements: fix.edits.map((e) => ({
            deletedRegion: region(e.range),
            insertedContent: { text: e.newText },
          })),
        },
      ],
    }));
  }
  return out;
}

function region(range: SourceRange): Sarif.Region {
  const r = oneBased(range);
  return { startLine: r.startLine, startColumn: r.startColumn, endLine: r.endLine, endColumn: r.endColumn };
}

/**
 * Paths under the working folder become relative URIs against SRCROOT (so the log is portable between
 * checkouts); a path outside it stays an absolute `file:` URI.
 */
function artifactLocation(path: string, cwd: string): Sarif.ArtifactLocation {
  const abs = resolve(cwd, path);
  const rel = relative(cwd, abs);
  if (rel === '' || rel.startsWith('..') || isAbsolute(rel)) return { uri: pathToFileURL(abs).href };
  return { uri: rel.split(sep).map(encodeURIComponent).join('/'), uriBaseId: 'SRCROOT' };
}
