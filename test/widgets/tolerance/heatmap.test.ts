import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { toleranceMapInProcess, toleranceCellSetup, type ToleranceMap, type ToleranceMapSpec } from "../../../src/tolerance";
import { computeExplorer } from "../../../widgets/explorer/model";
import { toleranceHtml } from "../../../widgets/tolerance/html";
import { renderSvg } from "../../../widgets/core/render/static";
import { CELLS_DATASET, DIVERGING_RANGE, NO_VALUE_COLOURS, toleranceHeatmapSpec } from "../../../widgets/tolerance/heatmap-spec";
import {
  axisEdges,
  cellExplorerState,
  decodeValue,
  encodeValue,
  heatmapCells,
  loadToleranceState,
  toleranceSummary,
  toleranceSummaryText,
  toleranceWidgetState,
  type HeatmapCell,
  type ToleranceWidgetState,
} from "../../../widgets/tolerance/model";
import { TOLERANCE_STATE_CLASS } from "../../../widgets/tolerance/names";

const ROOT = join(__dirname, "..", "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;

// Detuning −4 … +4 MHz (blue detuning is unstable), input coupling 0 … 100 % (0 % is invalid).
const MIXED: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 5 },
  y: { target: "cavity.inputCoupling", from: "0 %", to: "100 %", points: 3 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 48 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};

let map: ToleranceMap;
let state: ToleranceWidgetState;

beforeAll(async () => {
  map = await toleranceMapInProcess(squeezed, MIXED);
  state = toleranceWidgetState(squeezed, MIXED, map, { target: 3 });
});

type Layer = { transform: { filter: string }[]; encoding: Record<string, any> };
const layers = (spec: Record<string, unknown>): Layer[] => spec.layer as Layer[];

describe("heat-map data", () => {
  it("has every cell exactly once, at j · nx + i, with the cell's written values", () => {
    const cells = heatmapCells(state);
    const nx = map.x.written.length;
    expect(cells).toHaveLength(15);
    expect(new Set(cells.map((c) => `${c.i},${c.j}`)).size).toBe(15);
    cells.forEach((c, k) => {
      expect(c.j * nx + c.i).toBe(k);
      expect(c.xText).toBe(map.x.written[c.i]);
      expect(c.yText).toBe(map.y.written[c.j]);
    });
  });

  it("flags NaN cells by status and keeps finite figures exactly", () => {
    const cells = heatmapCells(state);
    expect(cells.map((c) => c.status)).toEqual(["invalid", "invalid", "invalid", "invalid", "invalid", "ok", "ok", "ok", "unstable", "unstable", "ok", "ok", "ok", "unstable", "unstable"]);
    cells.forEach((c, k) => {
      if (c.status === "ok") expect(c.value).toBe(map.values[k]);
      else {
        expect(Number.isNaN(map.values[k])).toBe(true);
        expect(c.value).toBeNull();
        expect(c.figureText).toBe("no value");
        expect(c.message.length).toBeGreaterThan(0);
      }
    });
    expect(cells[0].message).toMatch(/inputCoupling/);
    expect(cells[8].message).toMatch(/^setup: unstable/);
  });

  it("draws cells edge to edge in the written unit (MHz and %), halfway between values", () => {
    const cells = heatmapCells(state);
    expect(cells[0]).toMatchObject({ x0: -5, x1: -3, xValue: -4, y0: -25, y1: 25, yValue: 0 });
    expect(cells[14]).toMatchObject({ x0: 3, x1: 5, y0: 75, y1: 125 });
    for (let k = 1; k < 5; k++) expect(cells[k].x0).toBe(cells[k - 1].x1);
  });

  it("splits a log axis at geometric means", () => {
    const edges = axisEdges([1, 100, 10000], "log");
    expect(edges).toEqual([0.1, 10, 1000, 100000]);
    expect(axisEdges([0, 1, 2], "linear")).toEqual([-0.5, 0.5, 1.5, 2.5]);
  });

  it("round-trips infinite and missing figures through JSON", () => {
    for (const v of [1.5, -Infinity, Infinity, NaN, 0]) expect(Object.is(decodeValue(JSON.parse(JSON.stringify(encodeValue(v)))), v)).toBe(true);
    const back = loadToleranceState(JSON.stringify(state));
    expect(heatmapCells(back)).toEqual(heatmapCells(state));
    expect(() => loadToleranceState(JSON.stringify({ ...state, map: { ...state.map, status: [0] } }))).toThrow(/malformed/);
    expect(() => loadToleranceState(JSON.stringify({ ...state, format: "other" }))).toThrow(/not a tolerance-map state/);
  });
});

describe("heat-map spec", () => {
  it("colours computed cells on a diverging scale centred at 0 dB, symmetric around it", () => {
    const spec = toleranceHeatmapSpec(state);
    const [computed] = layers(spec);
    const color = computed.encoding.color;
    expect(color.field).toBe("value");
    expect(color.scale.domainMid).toBe(0);
    expect(color.scale.range).toEqual([...DIVERGING_RANGE]);
    expect(color.scale.domain[0]).toBe(-color.scale.domain[1]);
    const finite = heatmapCells(state)
      .filter((c) => c.value !== null)
      .map((c) => Math.abs(c.value as number));
    expect(color.scale.domain[1]).toBe(Math.max(...finite));
    expect(computed.transform).toEqual([{ filter: "isValid(datum.value)" }]);
  });

  it("draws failed cells in neutral greys with a legend of their own, only the statuses present", () => {
    const [, failed] = layers(toleranceHeatmapSpec(state));
    expect(failed.transform).toEqual([{ filter: "!isValid(datum.value)" }]);
    expect(failed.encoding.color.field).toBe("status");
    expect(failed.encoding.color.scale).toEqual({ domain: ["unstable", "invalid"], range: [NO_VALUE_COLOURS.unstable, NO_VALUE_COLOURS.invalid] });
    expect(failed.encoding.color.legend.title ?? failed.encoding.color.title).toBe("no value");
    const allOk = toleranceWidgetState(squeezed, MIXED, { ...map, status: new Uint8Array(15), values: new Float64Array(15).fill(1) });
    expect(layers(toleranceHeatmapSpec(allOk))).toHaveLength(1);
  });

  it("uses the axis scales and units, and tooltips give both written values, the figure and the status", () => {
    const spec = toleranceHeatmapSpec(state);
    const [computed] = layers(spec);
    expect(computed.encoding.x.title).toBe("cavity.detuning (MHz)");
    expect(computed.encoding.y.title).toBe("cavity.inputCoupling (%)");
    expect(computed.encoding.x.scale.type).toBe("linear");
    expect(computed.encoding.tooltip.map((t: { field: string }) => t.field)).toEqual(["xText", "yText", "figureText", "status", "message"]);
    expect((spec.datasets as Record<string, HeatmapCell[]>)[CELLS_DATASET]).toHaveLength(15);
    const logState = toleranceWidgetState(squeezed, MIXED, { ...map, x: { ...map.x, scale: "log", values: Float64Array.from([1, 2, 3, 4, 5]) } });
    expect(layers(toleranceHeatmapSpec(logState))[0].encoding.x.scale.type).toBe("log");
  });

  it("centres gains at 1", () => {
    const gains = toleranceWidgetState(squeezed, MIXED, { ...map, figure: { kind: "range-gain", unit: "", label: "volume gain" } });
    const color = layers(toleranceHeatmapSpec(gains))[0].encoding.color;
    expect(color.scale.domainMid).toBe(1);
    expect(color.scale.domain[0]).toBeLessThanOrEqual(1);
    expect(color.scale.domain[1]).toBeGreaterThanOrEqual(1);
  });

  it("renders to a static SVG with its axis titles and the no-value legend", async () => {
    const svg = await renderSvg(toleranceHeatmapSpec(state));
    expect(svg).toMatch(/^<svg/);
    expect(svg).toContain("cavity.detuning (MHz)");
    expect(svg).toContain("no value");
  });
});

describe("summary and HTML", () => {
  it("names the best cell and the fractions meeting 0 dB and the target", () => {
    const s = toleranceSummary(state);
    let best = -Infinity;
    let at = -1;
    map.values.forEach((v, k) => {
      if (map.status[k] === 0 && v > best) {
        best = v;
        at = k;
      }
    });
    expect(s.best?.value).toBe(best);
    expect(s.best && s.best.j * 5 + s.best.i).toBe(at);
    const ok = Array.from(map.values).filter((_v, k) => map.status[k] === 0);
    expect(s.atLeastNeutral).toBe(ok.filter((v) => v >= 0).length / 15);
    expect(s.atLeastTarget).toBe(ok.filter((v) => v >= 3).length / 15);
    const text = toleranceSummaryText(state);
    expect(text).toContain(`at cavity.detuning = ${s.best?.x}, cavity.inputCoupling = ${s.best?.y}`);
    expect(text).toMatch(/target 3 dB/);
    expect(text).toContain("4 unstable, 5 invalid");
  });

  it("escapes every label and carries the state as application/json that cannot close its element", () => {
    const evil = "<img src=x onerror=alert(1)></script><!--";
    const hostile = toleranceWidgetState({ ...squeezed, name: evil }, MIXED, map, { title: evil, labels: { "cavity.detuning": evil } });
    const html = toleranceHtml(hostile, { includeRuntime: false });
    expect(html).not.toContain("<img src=x");
    expect(html).not.toContain("</script><!--");
    expect(html).toContain("&lt;img src=x onerror=alert(1)&gt;");
    const m = new RegExp(`<script type="application/json" class="${TOLERANCE_STATE_CLASS}">([^]*?)</script>`).exec(html);
    expect(m).not.toBeNull();
    const back = loadToleranceState(m![1]);
    expect(back.settings.title).toBe(evil);
    expect(back.setup.name).toBe(evil);
    expect(html.match(/<script>/g)).toHaveLength(1);
    const spec = toleranceHeatmapSpec(hostile);
    expect(layers(spec)[0].encoding.x.title).toBe(`${evil} (MHz)`);
  });
});

describe("cell explorer", () => {
  it("is the cell's set-up with controls on both axes over the map's range, at the cell's written values", () => {
    const e = cellExplorerState(state, 1, 2);
    expect(e.values).toEqual({ "cavity.detuning": map.x.written[1], "cavity.inputCoupling": map.y.written[2] });
    expect(e.controls.map((c) => [c.target, c.min, c.max, c.scale])).toEqual([
      ["cavity.detuning", "-4 MHz", "4 MHz", "linear"],
      ["cavity.inputCoupling", "0 %", "100 %", "linear"],
    ]);
    expect(e.setup).toEqual(toleranceCellSetup(squeezed, map, 1, 2));
    expect(e.fingerprint).toBe(computeExplorer(e).fingerprint);
  });

  it("computes the same margin at the figure's frequency as the map's cell", () => {
    const e = cellExplorerState(state, 2, 1);
    const budget = computeExplorer(e).evaluation.budget;
    const k = budget.frequencies.findIndex((f) => f === map.figure.frequency);
    expect(k).toBeGreaterThanOrEqual(0);
    const sql = budget.references.find((r) => r.id === "sql")!.psd;
    expect(Math.abs(10 * Math.log10(sql[k] / budget.total[k]) - map.values[1 * 5 + 2])).toBeLessThan(1e-9);
  });

  it("refuses an unstable cell with a QuietframeError", () => {
    expect(() => cellExplorerState(state, 4, 1)).toThrow(/unstable/);
  });
});
