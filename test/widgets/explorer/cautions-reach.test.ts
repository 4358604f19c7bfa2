import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { explorerReach } from "../../../widgets/explorer/reach";
import { escapeHtml } from "../../../widgets/core/page/escape";
import { cautionHtml } from "../../../widgets/core/page/fallback";
import { explorerHtml } from "../../../widgets/explorer/html";
import { reachSummary } from "../../../widgets/explorer/summary";
import { CAUTION_HEADING } from "../../../widgets/core/page/summary-line";
import { summaryText } from "../../../widgets/explorer/notebook/figures";
import type { ExplorerState } from "../../../widgets/explorer/format";
import { probedBody } from "../../helpers/setups";

/**
 * The static fallback (and the notebook's text summary) must show the set-up's safety
 * cautions plainly, escaped, and the reach gauge of a strain budget.
 */
const ROOT = join(__dirname, "..", "..", "..");
const example = (name: string): SetupDescription => JSON.parse(readFileSync(join(ROOT, "examples", name), "utf8")) as SetupDescription;

function probeState(power: string): ExplorerState {
  const setup = probedBody({ body: { mass: "10 g" }, probe: { power } });
  return createExplorerState(setup, {
    controls: [{ target: "probe.power", label: "probe power", min: "100 uW", max: "5 W" }],
    settings: { grid: { from: "10 Hz", to: "100 kHz", points: 60 } },
  });
}

function fragment(state: ExplorerState): string {
  return explorerHtml(state, computeExplorer(state), { includeRuntime: false });
}

/** The fallback's caution box, or null. */
function cautionBox(html: string): string | null {
  return /<div class="qf-caution" role="note">[\s\S]*?<\/div>/.exec(html)?.[0] ?? null;
}

describe("safety cautions in the static fallback", () => {
  it("shows the escaped caution of a 2 W probe in a box of its own, before the figures", () => {
    const state = probeState("2 W");
    const cautions = computeExplorer(state).evaluation.cautions;
    expect(cautions).toHaveLength(1);
    expect(cautions[0]).toMatch(/'probe' uses 2 W of probe light: hazardous laser power/);
    const html = fragment(state);
    const box = cautionBox(html);
    expect(box).not.toBeNull();
    expect(box).toContain(`<strong>${CAUTION_HEADING}</strong>`);
    expect(box).toContain(`<li>${escapeHtml(cautions[0])}</li>`);
    // The quotes around the component name arrive as entities, never raw.
    expect(escapeHtml(cautions[0])).toContain("&#39;probe&#39;");
    expect(html).not.toContain(cautions[0]);
    expect(html.indexOf('class="qf-caution"')).toBeLessThan(html.indexOf('<dl class="qf-summary">'));
    expect(html.indexOf('class="qf-caution"')).toBeGreaterThan(html.indexOf('<div class="qf-fallback">'));
  });

  it("shows no caution for a 1 mW probe", () => {
    const state = probeState("1 mW");
    expect(computeExplorer(state).evaluation.cautions).toEqual([]);
    const html = fragment(state);
    expect(cautionBox(html)).toBeNull();
    expect(html).not.toContain('class="qf-caution"');
    expect(html).not.toMatch(/hazardous/);
  });

  it("follows the current values of the state, not the set-up as written", () => {
    const low = probeState("1 mW");
    const raised = { ...low, values: { "probe.power": "2 W" } };
    const full = { ...raised, fingerprint: computeExplorer(raised).fingerprint };
    expect(cautionBox(fragment(full))).toContain("uses 2 W of probe light");
    const high = probeState("2 W");
    const lowered = { ...high, values: { "probe.power": "1 mW" } };
    expect(cautionBox(fragment({ ...lowered, fingerprint: computeExplorer(lowered).fingerprint }))).toBeNull();
  });

  it("escapes every caution", () => {
    const hostile = `</li></ul></div><script>alert("x")</script> & 'q'`;
    const html = cautionHtml([hostile, "second"]);
    expect(html).not.toContain("<script>");
    expect(html).toContain(`<li>${escapeHtml(hostile)}</li><li>second</li>`);
    expect(cautionHtml([])).toBe("");
  });

  it("shows strong magnetic fields too", () => {
    const state = createExplorerState(example("hybrid-spin-reference.json"), { controls: [{ target: "cell.field", min: "0.1 mT", max: "2 mT" }] });
    // 0.314 mT: no field caution (the example's 4 K membrane and 106 W probe keep theirs).
    expect(cautionBox(fragment(state))).not.toMatch(/magnetic field/);
    const strong = { ...state, values: { "cell.field": "0.6 mT" } };
    const computation = computeExplorer(strong);
    expect(computation.evaluation.cautions.join(" ")).toMatch(/magnetic field/);
    expect(cautionBox(explorerHtml({ ...strong, fingerprint: computation.fingerprint }, computation, { includeRuntime: false }))).toContain(escapeHtml(computation.evaluation.cautions[0]));
  });

  it("the notebook text summary lists the caution before the figures, and none at 1 mW", () => {
    const high = probeState("2 W");
    const computation = computeExplorer(high);
    const text = summaryText(computation, high);
    const line = `caution: ${computation.evaluation.cautions[0]}`;
    expect(text).toContain(line);
    expect(text.indexOf(line)).toBeLessThan(text.indexOf("SQL"));
    const low = probeState("1 mW");
    expect(summaryText(computeExplorer(low), low)).not.toMatch(/caution|hazardous/);
  });
});

describe("the reach gauge in the static fallback", () => {
  const controls = [{ target: "ifo.power", min: "100 mW", max: "1 MW" }];

  it("a strain budget shows its reach against the initial set-up, escaped", () => {
    const state = createExplorerState(example("long-baseline-detector.json"), { controls });
    const moved = { ...state, values: { "ifo.power": "100 kW" } };
    const computation = computeExplorer(moved);
    const html = explorerHtml({ ...moved, fingerprint: computation.fingerprint }, computation, { includeRuntime: false });
    const reach = explorerReach(moved, computation);
    expect(reach?.available).toBe(true);
    const [line] = reachSummary(reach!);
    expect(line.text).toMatch(/×0\.\d+ range, ×0\.\d+ volume vs the initial set-up/);
    expect(html).toContain(`<dt>${escapeHtml(line.label)}</dt><dd>${escapeHtml(line.text)}</dd>`);
    // 750 kW in the arms at the initial values and 100 kW now: both hazardous.
    expect(cautionBox(html)).toContain("circulates 100 kW in each arm");
  });

  it("a displacement budget shows no reach", () => {
    const state = createExplorerState(example("free-test-mass.json"));
    const html = fragment(state);
    expect(html).not.toMatch(/Inspiral reach|Mpc/);
    expect(html).toContain('<dl class="qf-summary">');
  });
});
