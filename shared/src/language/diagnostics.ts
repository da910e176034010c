// Collects the language diagnostics of one parse. Every message is reported at most once per range, so that
// evaluating a design again for each corner never repeats what the nominal evaluation already said.
import type { LanguageDiagnostic, SourceRange } from './source';

type Code = LanguageDiagnostic['code'];
type Related = NonNullable<LanguageDiagnostic['related']>;

/** Where diagnostics go: the sink of a parse, or an adapter in front of it. */
export interface Reporter {
  error(code: Code, message: string, range: SourceRange, related?: Related): void;
  warning(code: Code, message: string, range: SourceRange, related?: Related): void;
}

const keyOf = (code: Code, message: string, r: SourceRange): string =>
  `${code}|${message}|${r.start.line}:${r.start.character}-${r.end.line}:${r.end.character}`;

export class DiagnosticSink implements Reporter {
  private readonly seen = new Set<string>();
  readonly items: LanguageDiagnostic[] = [];

  /** True when this exact diagnostic was already reported. */
  has(code: Code, message: string, range: SourceRange): boolean {
    return this.seen.has(keyOf(code, message, range));
  }

  error(code: Code, message: string, range: SourceRange, related?: Related): void {
    this.add({ code, severity: 'error', message, range, ...(related?.length ? { related } : {}) });
  }

  warning(code: Code, message: string, range: SourceRange, related?: Related): void {
    this.add({ code, severity: 'warning', message, range, ...(related?.length ? { related } : {}) });
  }

  private add(d: LanguageDiagnostic): void {
    const key = keyOf(d.code, d.message, d.range);
    if (this.seen.has(key)) return;
    this.seen.add(key);
    this.items.push(d);
  }
}

export const quote = (s: string): string => `\`${s}\``;

/** Quotes text the user typed that may be arbitrarily long (a 100 000-digit number), keeping messages short. */
export const quoteShort = (s: string, max = 24): string =>
  quote(s.length > max ? `${s.slice(0, max - 1)}…` : s);

const within = (r: SourceRange, outer: SourceRange): boolean =>
  (r.start.line > outer.start.line ||
    (r.start.line === outer.start.line && r.start.character >= outer.start.character)) &&
  (r.end.line < outer.end.line || (r.end.line === outer.end.line && r.end.character <= outer.end.character));

/**
 * Diagnostics found while evaluating one corner. Those on the corner's own line pass as they are; those
 * elsewhere (a field that only this corner's values make impossible) say which corner, and point at it;
 * and what the nominal evaluation already reported is not repeated.
 */
export class CornerReporter implements Reporter {
  constructor(
    private readonly base: DiagnosticSink,
    private readonly corner: string,
    private readonly statementRange: SourceRange,
    private readonly nameRange: SourceRange,
  ) {}

  error(code: Code, message: string, range: SourceRange, related?: Related): void {
    this.add('error', code, message, range, related);
  }

  warning(code: Code, message: string, range: SourceRange, related?: Related): void {
    this.add('warning', code, message, range, related);
  }

  private add(
    severity: 'error' | 'warning',
    code: Code,
    message: string,
    range: SourceRange,
    related?: Related,
  ): void {
    if (within(range, this.statementRange)) return this.base[severity](code, message, range, related);
    if (this.base.has(code, message, range)) return;
    this.base[severity](code, `In corner ${quote(this.corner)}: ${message}`, range, [
      ...(related ?? []),
      { range: this.nameRange, message: `corner ${quote(this.corner)}` },
    ]);
  }
}
