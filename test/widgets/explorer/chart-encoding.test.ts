import { describe, expect, test } from "vitest";
import { log10 } from "../../../src/index";
import { curveStyle, termRole } from "../../../widgets/core/look/encoding";
import { renderSvg } from "../../../widgets/core/render/static";
import { budgetSpec, chartCurves, CURVES_DATASET, curveRows, explorerFigureSpec, explorerMechanismPanel, MECHANISM_DATASET, RATIO_DATASET, sqlRatioRows } from "../../../widgets/explorer/budget-spec";
import { computeExplorer } from "../../../widgets/explorer/model";
import { exampleFiles, exampleState } from "./examples";

type Scale = { domain: string[]; range: unknown[] };
type Spec = {
  datasets: Record<string, unknown[]>;
  vconcat: { layer: { encoding: Record<string, { scale?: Scale }> }[] }[];
};

/** The colour, dash and width each series gets from the spec's own scales. */
function looks(spec: Spec): Map<string, { colour: unknown; dash: unknown; width: unknown }> {
  const encoding = spec.vconcat[0].layer.find((l) => l.encoding.color?.scale)?.encoding;
  if (!encoding) throw new Error("no series scales in the budget panel");
  const colour = encoding.color.scale as Scale;
  const dash = encoding.strokeDash.scale as Scale;
  const width = encoding.strokeWidth.scale as Scale;
  return new Map(colour.domain.map((s, i) => [s, { colour: colour.range[i], dash: dash.range[dash.domain.indexOf(s)], width: width.range[width.domain.indexOf(s)] }]));
}

function specOf(file: string): { spec: Spec; computation: ReturnType<typeof computeExplorer> } {
  const computation = computeExplorer(exampleState(file));
  return { spec: budgetSpec(computation.table, "displacement", { title: file }) as unknown as Spec, computation };
}

describe("the panel relative to the SQL", () => {
  test.each(exampleFiles())("%s: values are the engine's total ÷ SQL, in dB of power", (file) => {
    const { spec, computation } = specOf(file);
    const budget = computation.evaluation.budget;
    const sqlPsd = budget.references.find((r) => r.id === "sql")?.psd;
    expect(sqlPsd, "every shipped example has an SQL reference").toBeDefined();
    const table = computation.table;
    const total = table.columns[0].values;
    const sql = table.columns.find((c) => c.id === "sql")?.values as Float64Array;
    const rows = sqlRatioRows(table);
    expect(rows.length).toBe(table.frequencies.length);
    rows.forEach((row, i) => {
      expect(row.f).toBe(table.frequencies[i]);
      // Exactly the quotient of the plotted curves.
      expect(row.ratio).toBe(total[i] / sql[i]);
      // And, in dB, the quotient of the engine's PSDs: 10 log10(S_total / S_SQL) (definition of the decibel of power).
      expect(row.db).toBeCloseTo(10 * Math.log10(budget.total[i] / (sqlPsd as Float64Array)[i]), 9);
    });
    expect(spec.datasets[RATIO_DATASET]).toEqual(rows);
    expect(spec.vconcat.length).toBe(3);
  });

  test("a PSD table gives 10 log10 of the power ratio; a missing SQL gives no panel", () => {
    const frequencies = Float64Array.from([1, 2]);
    const table = {
      spectralDensity: "power" as const,
      unit: "m²/Hz",
      frequencies,
      columns: [
        { id: "total", label: "total", values: Float64Array.from([2, 0.5]) },
        { id: "sql", label: "SQL", values: Float64Array.from([1, 1]) },
      ],
    };
    // 10 log10 2 = 3.0103 dB above, 10 log10 0.5 = −3.0103 dB below (hand-computed).
    expect(sqlRatioRows(table).map((r) => r.db)).toEqual([10 * log10(2), 10 * log10(0.5)]);
    expect(sqlRatioRows(table)[1].db).toBeCloseTo(-3.0103, 4);
    const noSql = { ...table, columns: [table.columns[0]] };
    expect(sqlRatioRows(noSql)).toEqual([]);
    expect((budgetSpec(noSql, "displacement") as unknown as Spec).vconcat.length).toBe(2);
  });

  test("the target line is drawn at the level asked for", () => {
    const { computation } = specOf("cryogenic-membrane.json");
    const spec = budgetSpec(computation.table, "displacement", { targetDb: -3 }) as unknown as { vconcat: { layer: { mark: { type: string }; encoding: { y?: { datum?: number } } }[] }[] };
    const rules = spec.vconcat[1].layer.filter((l) => l.mark.type === "rule").map((l) => l.encoding.y?.datum);
    expect(rules).toEqual([0, -3]);
  });
});

describe("encoding by kind and source name", () => {
  test("a term keeps its colour, dash and width across set-ups that share it", () => {
    const shared = (a: string, b: string) => {
      const la = looks(specOf(a).spec);
      const lb = looks(specOf(b).spec);
      const common = [...la.keys()].filter((s) => lb.has(s));
      for (const s of common) expect(lb.get(s), s).toEqual(la.get(s));
      return common;
    };
    // Different set-ups: a plain laser readout and a hybrid set-up with a spin ensemble in the same beam.
    expect(shared("cryogenic-membrane.json", "hybrid-spin-reference.json")).toEqual(expect.arrayContaining(["laser: amplitude quadrature", "laser: phase quadrature", "detector: detection vacuum"]));
    expect(shared("cryogenic-membrane.json", "cryogenic-membrane-squeezed.json")).toEqual(expect.arrayContaining(["membrane: thermal noise", "cavity: internal loss (amplitude)"]));
  });

  test("the position of a term in the budget does not change its look", () => {
    const { computation } = specOf("cryogenic-membrane.json");
    const t = computation.table;
    const reversed = { ...t, columns: [t.columns[0], ...t.columns.slice(1).reverse()] };
    const a = looks(budgetSpec(t, "displacement") as unknown as Spec);
    const b = looks(budgetSpec(reversed, "displacement") as unknown as Spec);
    for (const [series, look] of a) expect(b.get(series), series).toEqual(look);
  });

  test.each(exampleFiles())("%s: no two curves of a chart look alike", (file) => {
    const seen = [...looks(specOf(file).spec).values()].map((l) => JSON.stringify([l.colour, l.dash]));
    expect(new Set(seen).size).toBe(seen.length);
  });

  test.each(exampleFiles())("%s: each term's colour family follows the engine's category of its noise", (file) => {
    const { computation } = specOf(file);
    const allowed: Record<string, string[]> = {
      "quantum-light": ["imprecision", "back-action", "quantum-light"],
      loss: ["loss-vacuum"],
      thermal: ["thermal"],
      technical: ["classical"],
      classical: ["classical"],
    };
    for (const term of computation.evaluation.budget.terms) expect(allowed[term.category], term.label).toContain(termRole(term));
  });

  test("a light source's amplitude quadrature is back-action, its phase quadrature imprecision (the resonant-readout split, DEVELOPERS.md)", () => {
    expect(termRole({ id: "a", label: "laser: amplitude quadrature" })).toBe("back-action");
    expect(termRole({ id: "b", label: "laser: phase quadrature" })).toBe("imprecision");
    expect(termRole({ id: "c", label: "squeezer: squeezed light" })).toBe("quantum-light");
    expect(termRole({ id: "total", label: "total" })).toBe("total");
    expect(termRole({ id: "sql", label: "SQL (free mass, 2ħ/(mΩ²))" })).toBe("sql");
    // The same source name gives the same dash whatever its role.
    expect(curveStyle({ id: "a", label: "laser: amplitude quadrature" }).dash).toEqual(curveStyle({ id: "b", label: "laser: phase quadrature" }).dash);
  });
});

describe("no duplicate curves", () => {
  test("the quantum-FDT thermal reference is not drawn over the identical thermal term; the CSV keeps it", () => {
    const { computation } = specOf("cryogenic-membrane.json");
    const table = computation.table;
    const reference = table.columns.find((c) => c.id === "thermal");
    const term = table.columns.find((c) => c.label === "membrane: thermal noise");
    expect(reference && term).toBeTruthy();
    // The two are the same curve (relative difference below 1e-12 at every frequency), which is why one is enough.
    (reference as { values: Float64Array }).values.forEach((v, i) => expect(Math.abs(v / (term as { values: Float64Array }).values[i] - 1)).toBeLessThan(1e-12));
    expect(chartCurves(table).map((c) => c.column.id)).not.toContain("thermal");
    expect(curveRows(table).some((r) => r.series === reference?.label)).toBe(false);
  });
});

describe("the key", () => {
  test.each(["long-baseline-detector.json", "hybrid-spin-reference.json"])("%s: each entry's symbol carries its curve's colour, width and dash pattern, and its full name", async (file) => {
    const { spec } = specOf(file);
    const svg = await renderSvg(spec as unknown as Record<string, unknown>);
    const samples = [...svg.matchAll(/<line transform="translate\(0,[\d.]+\)" x2="26" y2="0" stroke="([^"]+)" stroke-width="([^"]+)" stroke-dasharray="([^"]+)"\/>/g)].map((m) => ({
      colour: m[1],
      width: Number(m[2]),
      dash: m[3].split(",").map(Number),
    }));
    const want = [...looks(spec).values()].map((l) => ({ colour: l.colour, width: l.width, dash: l.dash }));
    expect(samples).toEqual(want);
    expect(new Set(want.map((w) => JSON.stringify(w.dash))).size).toBeGreaterThan(2);
    for (const series of looks(spec).keys()) expect(svg).toContain(`>${series.replace(/&/g, "&amp;").replace(/</g, "&lt;")}</text>`);
  });
});

test("the curves dataset is the plotted rows", () => {
  const { spec, computation } = specOf("free-test-mass.json");
  expect(spec.datasets[CURVES_DATASET]).toEqual(curveRows(computation.table));
});

describe("the mechanism panel", () => {
  test("squeezed light: the engine's imprecision, back-action and signed correlation as shares of the term, adding up to 1", () => {
    const state = exampleState("cryogenic-membrane-squeezed.json");
    const computation = computeExplorer(state);
    const panel = explorerMechanismPanel(computation);
    expect(panel?.source).toBe("squeezer");
    const term = computation.mechanisms.terms.find((t) => t.owner === "squeezer");
    if (!panel || !term) throw new Error("the squeezer's term has no mechanism split");
    const byPart = (part: string) => panel.rows.filter((r) => r.part === part);
    const f = computation.mechanisms.frequencies;
    byPart("imprecision").forEach((r, i) => {
      expect(r.f).toBe(f[i]);
      expect(r.value).toBe(term.imprecision[i] / term.psd[i]);
    });
    byPart("back-action").forEach((r, i) => expect(r.value).toBe(term.backAction[i] / term.psd[i]));
    byPart("correlation").forEach((r, i) => {
      expect(r.value).toBe(term.correlation[i] / term.psd[i]);
      // The parts add up to the term (the engine's split; here as shares: their sum is 1).
      expect(byPart("imprecision")[i].value + byPart("back-action")[i].value + r.value).toBeCloseTo(1, 6);
    });
    // Squeezing at an angle correlates the two: the correlation is negative somewhere, and the panel shows it signed.
    expect(byPart("correlation").some((r) => r.value < 0)).toBe(true);
    const spec = explorerFigureSpec(computation, state) as unknown as Spec;
    expect(spec.datasets[MECHANISM_DATASET]).toEqual(panel.rows);
    expect(spec.vconcat.length).toBe(4);
  });

  test("a laser that reads and pushes a membrane: its two quadrature terms are shown as one source", () => {
    const computation = computeExplorer(exampleState("cryogenic-membrane.json"));
    const panel = explorerMechanismPanel(computation);
    expect(panel?.source).toBe("laser");
    const term = computation.mechanisms.terms.find((t) => t.owner === "laser");
    expect(term?.budgetTerms).toEqual(expect.arrayContaining(["laser: amplitude quadrature", "laser: phase quadrature"]));
  });
});
