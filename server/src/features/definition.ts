// Go to definition: from any use of a name to where it is declared.
import type { Location } from 'vscode-languageserver';
import type { SourcePosition } from '../../../shared/src/language/source';
import type { DocumentReport } from '../../../shared/src/report';
import { designAt } from '../../../shared/src/service';
import { toRange } from '../convert';
import { symbolAt } from './target';

export function definition(report: DocumentReport, uri: string, position: SourcePosition): Location | null {
  const design = designAt(report, position);
  const hit = design && symbolAt(design, position);
  return hit ? { uri, range: toRange(hit.symbol.declaration) } : null;
}
