import { buildSync } from "esbuild";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { assemble } from "../../src/setup/assemble";
import { loadSetup } from "../../src/pipeline";
import { conditionalSteadyState, simulateTrajectory } from "../../src/timedomain";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "../browser/helpers/chromium";
import { probedBody } from "../helpers/setups";

/**
 * Same settings, same bits — also in a browser: the model code uses only + − × ÷, √ and the
 * portable elementary functions, so a run computed in headless Chromium must equal Node's to
 * the last bit (the state-file promise of the project).
 */
const SETUP = probedBody({
  bodyType: "oscillator",
  body: { mass: "1 ng", frequency: "100 kHz", Q: 1e3, temperature: "1 mK", damping: "symmetric" },
  probe: { measurementRate: "10 kHz" },
  efficiency: 0.9,
});
const SETTINGS = { duration: 2e-4, step: 1e-7, seed: 123456789, samples: 201 };
const REQUEST = {
  joint: [
    {
      label: "x + p",
      terms: [
        { component: "body", quadrature: "x" as const, weight: 1 },
        { component: "body", quadrature: "p" as const, weight: 1 },
      ],
    },
  ],
};

/** Hex of the doubles of a run that a figure would show. */
function fingerprint(r: ReturnType<typeof simulateTrajectory>, steady: Float64Array): string {
  const s = r.joint[0];
  const all = Float64Array.from([...s.truth, ...s.estimate, ...s.conditional, ...s.unconditional, ...r.records[0].values, r.minUncertaintyMargin, ...steady]);
  return Array.from(new Uint8Array(all.buffer), (b) => b.toString(16).padStart(2, "0")).join("");
}

describe("a seeded run gives the same bits in headless Chromium as in Node", () => {
  let session: BrowserSession;
  beforeAll(async () => {
    session = await openBrowser({ allow: LOCAL_ONLY });
  });
  afterAll(async () => {
    await session?.close();
  });

  it("truth, estimate, variances, records, margin and the steady conditional covariance", async () => {
    const root = join(__dirname, "..", "..");
    const bundle = buildSync({
      stdin: {
        contents: `
          import { loadSetup } from "./src/pipeline";
          import { assemble } from "./src/setup/assemble";
          import { simulateTrajectory, conditionalSteadyState } from "./src/timedomain";
          globalThis.runTimeDomain = (setup, settings, request) => {
            const model = assemble(loadSetup(setup)).model;
            const r = simulateTrajectory(model, settings, request);
            const s = r.joint[0];
            const all = Float64Array.from([...s.truth, ...s.estimate, ...s.conditional, ...s.unconditional, ...r.records[0].values, r.minUncertaintyMargin, ...conditionalSteadyState(model)]);
            return Array.from(new Uint8Array(all.buffer), (b) => b.toString(16).padStart(2, "0")).join("");
          };`,
        resolveDir: root,
        loader: "ts",
      },
      bundle: true,
      format: "iife",
      platform: "browser",
      write: false,
      target: "es2020",
    }).outputFiles[0].text;
    await session.page.setContent("<!doctype html><html><body></body></html>");
    await session.page.addScriptTag({ content: bundle });
    const inBrowser = await session.page.evaluate(([setup, settings, request]) => (globalThis as unknown as { runTimeDomain: (...a: unknown[]) => string }).runTimeDomain(setup, settings, request), [
      SETUP,
      SETTINGS,
      REQUEST,
    ] as const);
    const model = assemble(loadSetup(SETUP)).model;
    const inNode = fingerprint(simulateTrajectory(model, SETTINGS, REQUEST), conditionalSteadyState(model));
    expect(inBrowser.length).toBe(inNode.length);
    expect(inBrowser).toBe(inNode);
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });
});
