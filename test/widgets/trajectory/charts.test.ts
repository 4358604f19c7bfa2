import { describe, expect, it } from "vitest";
import { compile } from "vega-lite";
import { trajectoryCsv } from "../../../widgets/trajectory/csv";
import { computeTrajectory, createTrajectoryState } from "../../../widgets/trajectory/model";
import { trajectoryRows, timeAxis, partCurve, CURVES } from "../../../widgets/trajectory/series";
import { DATASETS, trajectoryPanelSpec, trajectorySpecs } from "../../../widgets/trajectory/specs";
import { jointDuanSum } from "../../../widgets/trajectory/duan";
import { hybrid, MEMBRANE_X, P_DIFF, shortRun, SUM_X } from "./fixtures";

const state = createTrajectoryState(hybrid, shortRun());
const { fingerprint: _f, ...base } = state;
const c = computeTrajectory(base);
const labels = state.joint.map((j) => j.label);

/** Splits one CSV line, honouring double quotes (RFC 4180, section 2). */
function splitCsvLine(line: string): string[] {
  const out: string[] = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') (cell += '"'), i++;
      else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ",") out.push(cell), (cell = "");
    else cell += ch;
  }
  out.push(cell);
  return out;
}

describe("chart rows", () => {
  it("put the ±1σ band at estimate ± √(conditional variance), point for point", () => {
    const rows = trajectoryRows(c.result);
    const j = c.result.joint[0];
    const mine = rows.joint.filter((r) => r.series === j.label);
    expect(mine).toHaveLength(c.result.time.length);
    mine.forEach((r, i) => {
      expect(r.estimate).toBe(j.estimate[i]);
      expect(r.truth).toBe(j.truth[i]);
      expect(r.upper).toBe(j.estimate[i] + Math.sqrt(j.conditional[i]));
      expect(r.lower).toBe(j.estimate[i] - Math.sqrt(j.conditional[i]));
    });
  });

  it("give the estimation error and its ±1σ band (estimate − truth, ±√conditional), and every record point", () => {
    const rows = trajectoryRows(c.result);
    const j = c.result.joint[0];
    rows.joint
      .filter((r) => r.series === j.label)
      .forEach((r, i) => {
        expect(r.error).toBe(j.estimate[i] - j.truth[i]);
        expect(r.sigma).toBe(Math.sqrt(j.conditional[i]));
        expect(r.normalizedError).toBe((j.estimate[i] - j.truth[i]) / Math.sqrt(j.conditional[i]));
      });
    expect(c.result.records.length).toBeGreaterThan(0);
    for (const rec of c.result.records) expect(rows.records.filter((r) => r.output === rec.output).map((r) => r.value)).toEqual(Array.from(rec.values));
  });

  it("hold conditional, unconditional and each system's part for every joint variable, and its zero-point", () => {
    const rows = trajectoryRows(c.result);
    const curves = new Set(rows.variance.filter((r) => r.series === labels[0]).map((r) => r.curve));
    expect(curves).toEqual(new Set([CURVES.conditional, CURVES.unconditional, partCurve("membrane"), partCurve("cell")]));
    // Zero-point variance of Σ w·q is Σ w² / 2 for unit commutators ([x, p] = i; vacuum variance 1/2 per quadrature).
    expect(rows.zeroPoints).toEqual([
      { series: labels[0], value: 1 },
      { series: labels[1], value: 0.5 },
    ]);
  });

  it("thin static figures to the requested points but keep both ends", () => {
    const rows = trajectoryRows(c.result, 100);
    const times = rows.joint.filter((r) => r.series === labels[0]).map((r) => r.t);
    expect(times.length).toBeLessThanOrEqual(101);
    expect(times[0]).toBe(0);
    expect(times[times.length - 1]).toBe(c.result.time[c.result.time.length - 1] * rows.axis.factor);
  });

  it("show time in the unit that suits the duration", () => {
    expect(timeAxis(20e-6)).toEqual({ factor: 1e6, unit: "µs" });
    expect(timeAxis(2e-3)).toEqual({ factor: 1e3, unit: "ms" });
    expect(timeAxis(5)).toEqual({ factor: 1, unit: "s" });
    expect(timeAxis(3e-9)).toEqual({ factor: 1e9, unit: "ns" });
  });
});

describe("Vega-Lite specs", () => {
  it("compile with Vega-Lite v5, five charts with a pair and three without (error, variances, record; entanglement)", () => {
    const rows = trajectoryRows(c.result);
    const specs = trajectorySpecs(rows, labels, state.pair);
    expect(specs).toHaveLength(5);
    for (const s of specs) expect(() => compile(s as never)).not.toThrow();
    expect(trajectorySpecs(rows, labels, null)).toHaveLength(3);
    expect(() => compile(trajectoryPanelSpec(rows, labels, state.pair, "t") as never)).not.toThrow();
  });

  it("draw the conditional variance and each part alone in styles of their own, the conditional widest and first", () => {
    const spec = trajectorySpecs(trajectoryRows(c.result), labels, state.pair)[1] as { layer: { encoding?: Record<string, { scale?: { domain: string[]; range: unknown[] } }> }[] };
    const enc = spec.layer[0].encoding ?? {};
    const curves = enc.strokeDash?.scale?.domain ?? [];
    const styles = curves.map((_, k) => JSON.stringify([enc.strokeDash?.scale?.range[k], enc.strokeWidth?.scale?.range[k]]));
    expect(curves).toContain(CURVES.conditional);
    expect(new Set(styles).size).toBe(curves.length);
    const widths = (enc.strokeWidth?.scale?.range ?? []) as number[];
    expect(widths[curves.indexOf(CURVES.conditional)]).toBe(Math.max(...widths));
    const rows = trajectoryRows(c.result).variance.filter((r) => r.series === labels[0]);
    expect(rows[0].curve).toBe(CURVES.conditional);
  });

  it("state the quadrature convention and a unit on every value axis", () => {
    const text = JSON.stringify(trajectorySpecs(trajectoryRows(c.result), labels, state.pair));
    expect(text).toContain("variance (dimensionless quadrature; vacuum variance ½; log scale)");
    expect(text).toContain("error / σ (σ = √conditional variance)");
    expect(text).toContain("record dy/dt (√Hz");
    expect(text).toContain("log-negativity (ebits)");
    expect(text).toContain("time (");
  });

  it("name their datasets, so the page can read what is plotted", () => {
    const text = JSON.stringify(trajectorySpecs(trajectoryRows(c.result), labels, state.pair));
    for (const name of Object.values(DATASETS)) expect(text).toContain(`"name":"${name}"`);
  });
});

describe("CSV", () => {
  it("holds every stored number exactly, under a header with units", () => {
    const lines = trajectoryCsv(c.result).trimEnd().split("\n");
    const header = splitCsvLine(lines[0]);
    expect(header[0]).toBe("time [s]");
    expect(lines).toHaveLength(c.result.time.length + 1);
    const col = (name: string) => header.indexOf(name);
    const j = c.result.joint[0];
    const rows = lines.slice(1).map(splitCsvLine);
    rows.forEach((r, i) => {
      expect(Number(r[0])).toBe(c.result.time[i]);
      expect(Number(r[col(`${j.label}: estimate`)])).toBe(j.estimate[i]);
      expect(Number(r[col(`${j.label}: conditional variance, membrane alone`)])).toBe(j.parts.membrane[i]);
      expect(Number(r[col("Duan sum Var(x₁ − x₂) + Var(p₁ + p₂), 1 = membrane, 2 = cell")])).toBe(c.result.entanglement!.duanSum[i]);
    });
  });
});

describe("Duan sum of the other sign convention", () => {
  // Duan, Giedke, Cirac & Zoller, Phys. Rev. Lett. 84, 2722 (2000): for separable states
  // Var(x1 + x2) + Var(p1 − p2) ≥ 2 in units where the vacuum variance is 1/2; rotating mode 2
  // by π (a local unitary) gives the engine's Var(x1 − x2) + Var(p1 + p2) with the same bound.
  const both = computeTrajectory({ ...base, joint: [SUM_X, P_DIFF, MEMBRANE_X] });

  it("is the sum of the conditional variances of x1 + x2 and p1 − p2, point for point", () => {
    const d = jointDuanSum([SUM_X, P_DIFF, MEMBRANE_X], both.result, ["membrane", "cell"])!;
    expect(d.label).toBe("Var(x₁ + x₂) + Var(p₁ − p₂)");
    both.result.time.forEach((_, i) => expect(d.values[i]).toBe(both.result.joint[0].conditional[i] + both.result.joint[1].conditional[i]));
  });

  it("is absent when the joint variables do not give it, or give the engine's own convention", () => {
    expect(jointDuanSum([SUM_X, MEMBRANE_X], c.result, ["membrane", "cell"])).toBeUndefined();
    expect(jointDuanSum([SUM_X, P_DIFF], both.result, null)).toBeUndefined();
    const minus = { label: "x m − x c", terms: [SUM_X.terms[0], { ...SUM_X.terms[1], weight: -1 }] };
    const plus = { label: "p m + p c", terms: [P_DIFF.terms[0], { ...P_DIFF.terms[1], weight: 1 }] };
    expect(jointDuanSum([minus, plus], computeTrajectory({ ...base, joint: [minus, plus] }).result, ["membrane", "cell"])).toBeUndefined();
  });

  it("is drawn beside the engine's sum against the same bound", () => {
    const rows = trajectoryRows(both.result, Infinity, [SUM_X, P_DIFF, MEMBRANE_X]);
    expect(rows.duanMeasures).toEqual(["Var(x₁ − x₂) + Var(p₁ + p₂)", "Var(x₁ + x₂) + Var(p₁ − p₂)"]);
    expect(rows.duan).toHaveLength(2 * both.result.time.length);
    expect(rows.duanBound).toBe(2);
  });
});
