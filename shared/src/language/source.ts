// Positions follow the Language Server Protocol: zero-based line, zero-based UTF-16 character offset.
export interface SourcePosition {
  readonly line: number;
  readonly character: number;
}

export interface SourceRange {
  readonly start: SourcePosition;
  readonly end: SourcePosition;
}

/** An error or warning of the language layer (syntax, units, references, physical range). */
export interface LanguageDiagnostic {
  readonly code: 'syntax' | 'unit' | 'reference' | 'plausibility';
  readonly severity: 'error' | 'warning';
  readonly message: string;
  readonly range: SourceRange;
  /** Other places involved (the first definition of a duplicate, the members of a cycle). */
  readonly related?: readonly { readonly range: SourceRange; readonly message: string }[];
}
