/** Quantities with units at the edge: the kinds, the parser (text → SI) and the formatter (SI → text). */
export { QUANTITY_KINDS, QUANTITY_KIND_INFO, isQuantityKind } from "./kinds";
export type { QuantityKind, QuantityKindInfo } from "./kinds";
export { parseQuantity } from "./parse";
export { formatQuantity, quantityParts, type QuantityParts } from "./format";
export { siunitxQuantity, unicodeParts, unicodeQuantity } from "./typeset";
export { SI_PREFIXES } from "./units";
