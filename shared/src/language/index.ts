// The language layer's facade: parse a design file, and the vocabulary the editor's completion offers.
export { parseDocument } from './parseDocument';
export {
  KEYWORDS,
  STATEMENT_KEYWORDS,
  ELEMENT_KINDS,
  REQUIREMENT_KINDS,
  BUILTIN_NODES,
  FIELDS_BY_STATEMENT,
  FLAGS_BY_STATEMENT,
  REQUIRED_FIELDS,
  FIELD_DIMENSIONS,
  VARIANTS_BY_STATEMENT,
} from './vocabulary';
export { UNIT_SPELLINGS, PREFIX_SCALES } from './unitTable';
export { FUNCTION_NAMES, FUNCTION_SIGNATURES } from './expressionFunctions';
/** Words that cannot be declared as a parameter, stage, node or corner name. */
export { RESERVED_NAMES } from './parseStatement';
export type * from './model';
export type * from './source';
