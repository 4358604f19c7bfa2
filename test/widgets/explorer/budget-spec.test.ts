import Ajv from "ajv";
import { describe, expect, test } from "vitest";
import type { BudgetTable } from "../../../src/engine/tabulate";
import { budgetSpec, chartCurves, curveRows, CURVES_DATASET } from "../../../widgets/explorer/budget-spec";
import { computeExplorer } from "../../../widgets/explorer/model";
import { exampleFiles, exampleState } from "./examples";

// Outside reference: the Vega-Lite v5 JSON schema shipped with vega-lite (draft-07), validated with ajv.
const vegaLiteSchema = require("vega-lite/build/vega-lite-schema.json") as object;
const validateVegaLite = new Ajv({ allErrors: true, strict: false }).compile(vegaLiteSchema);

describe("budgetSpec", () => {
  test.each(exampleFiles())("%s: a valid Vega-Lite v5 spec (ajv, vega-lite-schema.json)", (file) => {
    const computation = computeExplorer(exampleState(file));
    const spec = budgetSpec(computation.table, computation.evaluation.budget.quantity.name, { title: "t" });
    expect(validateVegaLite(spec), JSON.stringify(validateVegaLite.errors?.slice(0, 3))).toBe(true);
  });

  test("the schema validator is live: it refuses an unknown mark", () => {
    const computation = computeExplorer(exampleState("free-test-mass.json"));
    const spec = { ...budgetSpec(computation.table, "displacement"), mark: { type: "squiggle" } };
    expect(validateVegaLite(spec)).toBe(false);
  });

  test("one series per drawn column, the named dataset holds every plottable point", () => {
    const computation = computeExplorer(exampleState("cryogenic-membrane.json"));
    const table = computation.table;
    type Panel = { data: { name?: string }; layer: { encoding: { color?: { scale?: { domain: string[] } } } }[] };
    const spec = budgetSpec(table, "displacement") as { datasets: Record<string, unknown[]>; vconcat: Panel[] };
    expect(spec.vconcat[0].data.name).toBe(CURVES_DATASET);
    // Every column but the quantum-FDT thermal reference, which lies on the thermal term.
    const drawn = table.columns.filter((c) => c.id !== "thermal");
    expect(chartCurves(table).map((c) => c.column)).toEqual(drawn);
    expect(spec.datasets[CURVES_DATASET].length).toBe(drawn.length * table.frequencies.length);
    const colour = spec.vconcat[0].layer.find((l) => l.encoding.color?.scale)?.encoding.color?.scale;
    expect(colour?.domain).toEqual(["total", ...drawn.slice(1).map((c) => c.label)]);
  });
});

describe("curveRows", () => {
  const table: BudgetTable = {
    spectralDensity: "power",
    unit: "m²/Hz",
    frequencies: Float64Array.from([1, 2, 3, 4]),
    columns: [
      { id: "total", label: "total", values: Float64Array.from([1, Infinity, 3, 4]) },
      { id: "laser", label: "laser: shot noise", values: Float64Array.from([0, 2, Number.NaN, -1]) },
      { id: "sql", label: "SQL", values: Float64Array.from([5, 5, 5, 5]) },
    ],
  };

  test("points that a log axis cannot show are left out; kinds follow the column", () => {
    const rows = curveRows(table);
    expect(rows.filter((r) => r.series === "total").map((r) => r.f)).toEqual([1, 3, 4]);
    expect(rows.filter((r) => r.series === "laser: shot noise")).toEqual([{ f: 2, value: 2, series: "laser: shot noise", kind: "term" }]);
    expect(rows.filter((r) => r.kind === "reference").length).toBe(4);
    expect(rows.every((r) => Number.isFinite(r.value) && r.value > 0)).toBe(true);
  });
});
