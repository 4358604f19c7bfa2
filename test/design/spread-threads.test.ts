/**
 * Monte Carlo spreads with the samples on worker threads give the bits of the in-process run
 * with the same seed: every drawn value, every sample's figure, the bands, the statistics, the
 * first failure's message and the evaluation count. Reference: spreadAnalysis in this thread
 * (common practice, no outside source: the claim under test is identity with it).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { spreadAnalysis } from "../../src/design";
import { QuietframeError } from "../../src/errors";
import { bits, FIGURE, GRID, UNCERTAIN } from "../helpers/spread-scenario";
import { spreadAnalysisOnThreads } from "../../src/node";
import type { SetupDescription } from "../../src/setup/format";

const squeezed = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;

describe("spreadAnalysisOnThreads", () => {
  it("gives the in-process result bit for bit on 2 and 3 threads, failures and bands included", async () => {
    const options = { samples: 300, seed: 11, grid: GRID, target: "2 dB" };
    const inProcess = spreadAnalysis(squeezed, FIGURE, UNCERTAIN, options);
    expect(inProcess.failed.unstable).toBeGreaterThan(0);
    expect(inProcess.failed.unstable).toBeLessThan(300);
    expect(inProcess.bands).toBeDefined();
    for (const workers of [2, 3]) {
      const threaded = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...options, workers });
      expect(bits(threaded)).toEqual(bits(inProcess));
    }
  });

  it("without bands, from JSON text, and in this thread with workers: 1", async () => {
    const options = { samples: 40, seed: 3, grid: GRID, bands: false };
    const inProcess = spreadAnalysis(JSON.stringify(squeezed), FIGURE, UNCERTAIN, options);
    expect(inProcess.bands).toBeUndefined();
    expect(bits(await spreadAnalysisOnThreads(JSON.stringify(squeezed), FIGURE, UNCERTAIN, { ...options, workers: 2 }))).toEqual(bits(inProcess));
    expect(bits(await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { ...options, workers: 1 }))).toEqual(bits(spreadAnalysis(squeezed, FIGURE, UNCERTAIN, options)));
  });

  it("rejects what spreadAnalysis refuses, with the same words, and a bad number of threads naming options.workers", async () => {
    const bad = [{ target: "cavity.colour", value: "± 1 %" }];
    let message = "";
    try {
      spreadAnalysis(squeezed, FIGURE, bad, { samples: 10 });
    } catch (e) {
      message = (e as Error).message;
    }
    expect(message).not.toBe("");
    await expect(spreadAnalysisOnThreads(squeezed, FIGURE, bad, { samples: 10, workers: 2 })).rejects.toThrow(message);
    for (const workers of [0, 1.5, "2"]) {
      const error = await spreadAnalysisOnThreads(squeezed, FIGURE, UNCERTAIN, { samples: 10, workers: workers as number }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(QuietframeError);
      expect((error as QuietframeError).message).toMatch(/^options\.workers = .*is not a usable number of threads; allowed: an integer ≥ 1/);
    }
  });
});
