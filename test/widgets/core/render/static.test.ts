import { beforeAll, describe, expect, test } from "vitest";
import { QuietframeError } from "../../../../src/errors";
import { tableToCsv, type BudgetTable } from "../../../../src/engine/tabulate";
import { budgetSpec, chartCurves, explorerMechanismPanel, MECHANISM_PARTS } from "../../../../widgets/explorer/budget-spec";
import { frequencyAxis } from "../../../../widgets/core/look/layout";
import { INK, ROLE_COLOURS } from "../../../../widgets/core/look/palette";
import { computeExplorer, createExplorerState } from "../../../../widgets/explorer/model";
import { renderPng, renderSvg } from "../../../../widgets/core/render/static";
import { explorerFigures, type ExplorerFigures } from "../../../../widgets/explorer/figures";
import type { ExplorerState } from "../../../../widgets/explorer/format";
import { exampleFiles, exampleSetup, exampleState } from "../../explorer/examples";

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** Width and height from the PNG's IHDR chunk (PNG specification, ISO/IEC 15948, §11.2.2). */
function pngSize(png: Uint8Array): { width: number; height: number } {
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  expect(String.fromCharCode(...png.slice(12, 16))).toBe("IHDR");
  return { width: view.getUint32(16), height: view.getUint32(20) };
}

function svgSize(svg: string): { width: number; height: number } {
  const root = /^<svg[^>]*>/.exec(svg)?.[0] ?? "";
  return { width: Number(/ width="([\d.]+)"/.exec(root)?.[1]), height: Number(/ height="([\d.]+)"/.exec(root)?.[1]) };
}

/** One <path> per line mark that Vega drew, with its stroke colour. */
function linePaths(svg: string): string[] {
  return [...svg.matchAll(/<path[^>]*aria-roledescription="line mark"[^>]*>/g)].map((m) => /stroke="([^"]+)"/.exec(m[0])?.[1] ?? "");
}

function textElements(svg: string): string[] {
  return [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
}

/** The series scales of the budget panel (colour, dash, width by curve name). */
function seriesColours(spec: Record<string, unknown>): { domain: string[]; range: string[] } {
  const layers = (spec.vconcat as { layer: { encoding: { color?: { scale?: { domain: string[]; range: string[] } } } }[] }[])[0].layer;
  const scale = layers.find((l) => l.encoding.color?.scale)?.encoding.color?.scale;
  if (!scale) throw new Error("no colour scale in the budget panel");
  return scale;
}

const figures = new Map<string, { state: ExplorerState; figures: ExplorerFigures }>();

beforeAll(async () => {
  for (const file of exampleFiles()) {
    const state = exampleState(file);
    const result = await explorerFigures(computeExplorer(state), state);
    figures.set(file, { state, figures: result });
  }
});

describe("explorerFigures on the shipped examples", () => {
  test.each(exampleFiles())(
    "%s: one line per drawn curve in the chart's own colours, the ratio to the SQL, one per mechanism part (the total's casing is decoration, hidden from assistive technology)",
    (file) => {
      const { state, figures: f } = figures.get(file)!;
      const computation = computeExplorer(state);
      const table = computation.table;
      const strokes = linePaths(f.svg);
      const drawn = chartCurves(table);
      const parts = explorerMechanismPanel(computation) ? MECHANISM_PARTS.length : 0;
      expect(strokes.length).toBe(drawn.length + 1 + parts);
      const scale = seriesColours(f.spec);
      expect(scale.domain).toEqual(drawn.map((c) => c.series));
      const partColours = parts ? [ROLE_COLOURS.imprecision, ROLE_COLOURS["back-action"], ROLE_COLOURS["quantum-light"]] : [];
      expect(new Set(strokes)).toEqual(new Set([...scale.range, ROLE_COLOURS.total, ...partColours]));
      expect(f.svg).toContain(`stroke="${INK.halo}" stroke-width="5.5"`);
    },
  );

  test.each(exampleFiles())("%s: axis titles carry units (frequency in the band's unit); the key names every drawn curve in full", (file) => {
    const { state, figures: f } = figures.get(file)!;
    const texts = textElements(f.svg);
    const computation = computeExplorer(state);
    const grid = computation.table.frequencies;
    expect(texts).toContain(`frequency [${frequencyAxis(grid[0], grid[grid.length - 1]).unit}]`);
    expect(texts).toContain(`${computation.evaluation.budget.quantity.name} ASD [${computation.table.unit}]`);
    expect(texts).toContain("total ÷ SQL [dB]");
    for (const c of chartCurves(computation.table)) {
      const label = c.series.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
      expect(texts, c.series).toContain(label);
    }
    // The title defaults to the set-up's name.
    expect(texts).toContain(exampleSetup(file).name);
  });

  test.each(exampleFiles())("%s: PNG at the default scale 2, CSV of the plotted table", (file) => {
    const { state, figures: f } = figures.get(file)!;
    expect(Array.from(f.png.slice(0, 8))).toEqual(PNG_SIGNATURE);
    const svg = svgSize(f.svg);
    // Column-width figure: at least the plot panel wide.
    expect(svg.width).toBeGreaterThan(330);
    expect(pngSize(f.png)).toEqual({ width: 2 * svg.width, height: 2 * svg.height });
    const computation = computeExplorer(state);
    expect(f.csv).toBe(tableToCsv(computation.table));
    expect(f.csv.split("\n")[0]).toContain(`total [${computation.table.unit}]`);
    expect(f.csv.trimEnd().split("\n").length).toBe(state.settings.grid.points + 1);
  });
});

describe("renderSvg", () => {
  test("power spectral densities are titled PSD with squared units", async () => {
    const state = createExplorerState(exampleSetup("free-test-mass.json"), { settings: { spectralDensity: "power" } });
    const { svg } = await explorerFigures(computeExplorer(state), state, { scale: 1 });
    expect(textElements(svg)).toContain("displacement PSD [m²/Hz]");
  });

  test("a set-up name with markup is escaped, never an element", async () => {
    const setup = { ...exampleSetup("free-test-mass.json"), name: '<script>alert(1)</script> & "<b>bold</b>"' };
    const state = createExplorerState(setup);
    const { svg, png } = await explorerFigures(computeExplorer(state), state);
    expect(svg).not.toMatch(/<script/i);
    expect(svg).not.toMatch(/<b>/);
    expect(textElements(svg)).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; "&lt;b&gt;bold&lt;/b&gt;"');
    // resvg parses the SVG as XML (a second, strict reader): escaped text keeps the document well formed.
    expect(Array.from(png.slice(0, 8))).toEqual(PNG_SIGNATURE);
  });

  test("a title with markup is escaped, the state's title wins over the set-up's name", async () => {
    const state = createExplorerState(exampleSetup("free-test-mass.json"), { settings: { title: "<script>alert(1)</script><img src=x onerror=alert(2)>" } });
    const { svg } = await explorerFigures(computeExplorer(state), state, { scale: 1 });
    expect(svg).not.toMatch(/<script|<img/i);
    expect(svg).toContain("&lt;script&gt;alert(1)&lt;/script&gt;&lt;img src=x onerror=alert(2)&gt;");
    expect(textElements(svg)).not.toContain(exampleSetup("free-test-mass.json").name);
  });

  test("curve labels with markup (legend text and aria labels) are escaped", async () => {
    const f = Float64Array.from([1, 10, 100]);
    const table: BudgetTable = {
      spectralDensity: "amplitude",
      unit: "m/√Hz",
      frequencies: f,
      columns: [
        { id: "total", label: "total", values: Float64Array.from([3, 2, 1]) },
        { id: "t1", label: '<b>bold</b> "quoted" <script>x</script>', values: Float64Array.from([2, 1, 0.5]) },
        { id: "sql", label: "SQL & <i>friends</i>", values: Float64Array.from([1, 1, 1]) },
      ],
    };
    const svg = await renderSvg(budgetSpec(table, "displacement", { title: "<tspan>t</tspan>" }));
    expect(svg).not.toMatch(/<b>|<i>|<script|<tspan>/);
    expect(svg).toContain("&lt;b&gt;bold&lt;/b&gt;");
    expect(svg).toContain("SQL &amp; &lt;i&gt;friends&lt;/i&gt;");
    // Total, term, SQL and the ratio to the SQL.
    expect(linePaths(svg).length).toBe(4);
    // Attribute values: no raw quote or angle bracket inside any attribute.
    for (const m of svg.matchAll(/="([^"]*)"/g)) expect(m[1]).not.toMatch(/[<>]/);
  });

  test("curves with no plottable point draw no line", async () => {
    const table: BudgetTable = {
      spectralDensity: "amplitude",
      unit: "m/√Hz",
      frequencies: Float64Array.from([1, 10, 100]),
      columns: [
        { id: "total", label: "total", values: Float64Array.from([3, 2, 1]) },
        { id: "zero-point", label: "zero", values: Float64Array.from([0, 0, 0]) },
      ],
    };
    // The total alone: no SQL, so no ratio panel.
    expect(linePaths(await renderSvg(budgetSpec(table, "displacement"))).length).toBe(1);
  });

  test("external data are refused (and the refusal is reported as a warning)", async () => {
    for (const url of ["https://example.invalid/curves.json", "curves.json"]) {
      const warnings: string[] = [];
      const svg = await renderSvg(
        { data: { url }, mark: "line", encoding: { x: { field: "a", type: "quantitative" }, y: { field: "b", type: "quantitative" } } },
        { onWarning: (m) => warnings.push(m) },
      );
      expect(linePaths(svg).length).toBe(0);
      expect(warnings.join("\n")).toContain(`static figures load nothing (asked for ${url})`);
    }
  });

  test("specs that draw images are refused", async () => {
    const spec = { data: { values: [{ a: 1 }] }, mark: "image", encoding: { url: { value: "https://example.invalid/x.png" }, x: { field: "a", type: "quantitative" } } };
    await expect(renderSvg(spec)).rejects.toThrow(QuietframeError);
    await expect(renderSvg(spec)).rejects.toThrow(/spec: draws <image> elements/);
  });

  test("a spec that is not one is a QuietframeError", async () => {
    await expect(renderSvg(null as unknown as Record<string, unknown>)).rejects.toThrow(/^spec.*must be an object/);
    await expect(renderSvg({ mark: "nonsense" })).rejects.toThrow(QuietframeError);
  });
});

describe("renderPng", () => {
  let svg = "";
  beforeAll(() => {
    svg = figures.get("free-test-mass.json")!.figures.svg;
  });

  test.each([1, 1.5, 2, 3])("scale %d: IHDR size is scale × SVG size", (scale) => {
    const png = renderPng(svg, { scale });
    expect(Array.from(png.slice(0, 8))).toEqual(PNG_SIGNATURE);
    const size = svgSize(svg);
    expect(pngSize(png)).toEqual({ width: Math.round(scale * size.width), height: Math.round(scale * size.height) });
  });

  test("renders without any system font (text is left out, shapes stay)", () => {
    const png = renderPng(svg, { scale: 1, loadSystemFonts: false });
    expect(Array.from(png.slice(0, 8))).toEqual(PNG_SIGNATURE);
    expect(pngSize(png)).toEqual(svgSize(svg));
  });

  test("bad scales and bad SVG are QuietframeErrors naming the field", () => {
    for (const scale of [0, -1, Number.NaN, Number.POSITIVE_INFINITY, 100, "2" as unknown as number]) {
      expect(() => renderPng(svg, { scale }), String(scale)).toThrow(/^scale.*not a usable scale/);
    }
    // In range, but too many pixels for a 1000 × 1000 drawing.
    const large = '<svg xmlns="http://www.w3.org/2000/svg" width="1000" height="1000"><rect width="10" height="10"/></svg>';
    expect(() => renderPng(large, { scale: 16 })).toThrow(/^scale = 16: would make a 16000 × 16000 image/);
    expect(() => renderPng("not svg")).toThrow(/^svg.*not SVG text/);
    expect(() => renderPng("<svg><g></svg>")).toThrow(/^svg: could not be read/);
    expect(() => renderPng(42 as unknown as string)).toThrow(QuietframeError);
  });
});
