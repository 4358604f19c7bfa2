/** One model's entry in the widget model specification, as quietframe keeps it. */
export interface ControlSpec {
  model: { module: string; name: string; version: string };
  view: { module: string | null; name: string | null; version: string };
  /** Every non-reference attribute with its default. */
  state: Record<string, unknown>;
  /** Attributes that hold another model ("IPY_MODEL_<id>"), by the model they need. */
  refs: Record<string, string>;
  /** Type of each attribute in the specification ("float", "int", "bool", "string", "array", …). */
  attributes: Record<string, { type: string; allowNone?: boolean; enum?: readonly unknown[] }>;
}
