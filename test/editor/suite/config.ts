// What the outer runner hands the extension-host suite: a JSON file named by AMPNOTE_EDITOR_SUITE.
// Written by test/editor/run.mjs (code-server) and test/editor/runDesktop.mjs (desktop VS Code).

export interface ExpectedFinding {
  readonly code: string;
  readonly severity: 'error' | 'warning' | 'info';
  /** Zero-based, as in the protocol. */
  readonly range: {
    readonly start: { readonly line: number; readonly character: number };
    readonly end: { readonly line: number; readonly character: number };
  };
  readonly message?: string;
  /** The fixes the checker offers for this finding (titles as shown in the editor's quick-fix menu). */
  readonly fixes?: readonly { readonly title: string; readonly preferred: boolean }[];
}

export interface ExpectedFile {
  /** Path relative to the workspace folder. */
  readonly file: string;
  /** Where the expectation comes from, for failure messages (e.g. `ampnote check --format json`). */
  readonly source: string;
  readonly findings: readonly ExpectedFinding[];
  /** Each design's place and figures, from `ampnote analyze FILE --json`. */
  readonly designs: readonly ExpectedDesign[];
}

export interface ExpectedDesign {
  readonly name: string;
  readonly range: ExpectedFinding['range'];
  /** Nominal poles, |s|/2π in Hz. */
  readonly polesHz: readonly number[];
  readonly phaseMarginDeg: { readonly nominal: number | null; readonly worst: number | null };
  readonly ugfHz: { readonly nominal: number | null; readonly worst: number | null };
}

export interface SuiteConfig {
  /** `full`: every check; `smoke`: the extension is installed from its package, diagnostics only. */
  readonly mode: 'full' | 'smoke';
  /** Absolute path of the workspace folder the editor has open (a scratch copy of the examples). */
  readonly workspace: string;
  /** Where the suite writes its per-check results (JSON array). */
  readonly results: string;
  readonly expected: readonly ExpectedFile[];
}
