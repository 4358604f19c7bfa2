/** The frequency grid of a command line: the set-up's own, with --from/--to/--points overriding it. */
import { checkGrid, type FrequencyGridSpec } from "../setup/grid";
import { parseQuantity } from "../units";

export interface GridOptionValues {
  from?: string;
  to?: string;
  points?: string;
}

/** The set-up's grid, with --from/--to/--points overriding it; errors name the option typed or the set-up's field. */
export function gridFromOptions(base: FrequencyGridSpec, values: GridOptionValues): FrequencyGridSpec {
  return checkGrid(
    {
      from: values.from === undefined ? base.from : parseQuantity(values.from, "frequency", "--from"),
      to: values.to === undefined ? base.to : parseQuantity(values.to, "frequency", "--to"),
      points: values.points === undefined ? base.points : Number(values.points),
    },
    "grid",
    { from: values.from ?? base.from, to: values.to ?? base.to, points: values.points ?? base.points },
    // Name the option the user typed, or the set-up's grid field when the value came from there.
    (field) => (values[field] === undefined ? `grid.${field}` : `--${field}`),
  );
}
