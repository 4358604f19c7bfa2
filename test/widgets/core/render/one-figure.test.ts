import { describe, expect, test } from "vitest";
import { FIGURE, frequencyAxis } from "../../../../widgets/core/look/layout";
import { kindOutput } from "../../../../widgets/core/render/kind-output";
import { renderSvg } from "../../../../widgets/core/render/static";
import { liveSpec } from "../../../../widgets/explorer/browser/chart-view";
import { budgetSpec, chartCurves, explorerMechanismPanel } from "../../../../widgets/explorer/budget-spec";
import { explorerKind } from "../../../../widgets/explorer/kind";
import { chartPatch } from "../../../../widgets/explorer/live/chart-state";
import { chartBundle, VEGA_LITE_MIME } from "../../../../widgets/explorer/notebook/chart";
import { exampleFiles, exampleState } from "../../explorer/examples";

/**
 * One figure everywhere: the page (the live view's spec), `quietframe render` (the kind's
 * figure, SVG/PNG), the notebook's static image and the kernel's chart model draw one layout.
 */

/** The spec without its numbers and without what only the live view drops (tooltips, ARIA, sorting, parsing). */
function layoutOf(spec: unknown): unknown {
  if (Array.isArray(spec)) return spec.map(layoutOf);
  if (typeof spec !== "object" || spec === null) return spec;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(spec)) {
    if (["datasets", "tooltip", "aria", "order", "format"].includes(k)) continue;
    if (k === "data" && typeof (v as { name?: unknown }).name === "string") continue;
    out[k] = layoutOf(v);
  }
  return out;
}

/** Where every group sits and every text says, in drawing order: the SVG's layout. */
function svgLayout(svg: string): { size: string; translates: string[]; texts: string[] } {
  return {
    size: /^<svg[^>]* width="([\d.]+)" height="([\d.]+)"/.exec(svg)?.slice(1).join("×") ?? "",
    translates: [...svg.matchAll(/<g transform="translate\(([^)]*)\)"/g)].map((m) => m[1]),
    texts: [...svg.matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]),
  };
}

/** Vega numbers clip paths with a counter shared by every render in the process; number them by first appearance. */
function clipIdsRenumbered(svg: string): string {
  const ids = new Map<string, number>();
  return svg.replace(/clip\d+/g, (id) => {
    if (!ids.has(id)) ids.set(id, ids.size + 1);
    return `clip${ids.get(id)}`;
  });
}

function rootOrigin(svg: string): number[] {
  return (/<g fill="none" stroke-miterlimit="10" transform="translate\(([\d.]+),([\d.]+)\)"/.exec(svg)?.slice(1) ?? []).map(Number);
}

describe.each(exampleFiles())("%s", (file) => {
  const state = exampleState(file);
  const loaded = explorerKind.load(state, file);
  const { computation } = loaded;
  const quantity = computation.evaluation.budget.quantity.name;
  const title = state.settings.title ?? computation.setup.name ?? "";
  const rendered = explorerKind.figure(loaded).spec;

  test("page, render, notebook and kernel chart share one spec layout", async () => {
    const page = liveSpec(budgetSpec(computation.table, quantity, { title, mechanism: explorerMechanismPanel(computation) }));
    const notebook = (await chartBundle(state))[VEGA_LITE_MIME];
    const kernel = chartPatch(state, computation, 1).spec;
    expect(layoutOf(page)).toEqual(layoutOf(rendered));
    expect(layoutOf(notebook)).toEqual(layoutOf(rendered));
    expect(layoutOf(kernel)).toEqual(layoutOf(rendered));
  });

  test("the notebook's static image is the render's SVG; the page's chart has the same layout", async () => {
    const svg = new TextDecoder().decode(await kindOutput(explorerKind, loaded, "svg", 2));
    expect(clipIdsRenumbered(String((await chartBundle(state))["image/svg+xml"]))).toBe(clipIdsRenumbered(svg));
    const page = await renderSvg(liveSpec(budgetSpec(computation.table, quantity, { title, mechanism: explorerMechanismPanel(computation) })));
    expect(svgLayout(page)).toEqual(svgLayout(svg));
  });

  test("the render's axes: fixed left margin, every frequency tick labelled, every key entry whole", async () => {
    const svg = await renderSvg(rendered);
    // The plot starts at the same place whatever the y labels are: the padding, the y title's
    // fixed offset and its height (it is rotated, its baseline toward the plot); Vega rounds the
    // bounds of rotated text outward, which can add one pixel.
    const [x0] = rootOrigin(svg);
    const margin = FIGURE.padding.left - FIGURE.yTitleX + FIGURE.fontSize;
    expect([margin, margin + 1]).toContain(x0);
    const texts = svgLayout(svg).texts;
    const f = computation.table.frequencies;
    const axis = frequencyAxis(f[0], f[f.length - 1]);
    expect(axis.ticks.length).toBeGreaterThanOrEqual(3);
    for (const tick of axis.ticks) expect(texts, String(tick)).toContain(String(Number((tick / axis.divisor).toPrecision(4))));
    for (const c of chartCurves(computation.table)) expect(texts).toContain(c.series.replace(/&/g, "&amp;").replace(/</g, "&lt;"));
    expect(texts.some((t) => t.endsWith("…"))).toBe(false);
  });
});
