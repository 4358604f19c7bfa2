import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../../../src/cli/run";
import { seriesFingerprint } from "../../../../widgets/core/state/series-fingerprint";

/**
 * A referee recomputes fingerprints from docs/fingerprint.md alone: the hashing here is written
 * from that page with Node's own crypto (SHA-256 of FIPS 180-4) and Buffer's little-endian
 * binary64 writer, and reads the numbers back from the CSV files `quietframe render` writes, as
 * a referee with only the state files and the CLI would. No quietframe code computes a digest.
 */
const ROOT = join(__dirname, "..", "..", "..", "..");
const SPEC = readFileSync(join(ROOT, "docs", "fingerprint.md"), "utf8");
const STATES = join(ROOT, "examples", "states");

/** The fingerprint of docs/fingerprint.md: labels as UTF-8 text and a line feed, series as label then binary64 LE. */
class SpecFingerprint {
  private readonly parts: Buffer[] = [];
  label(text: string): this {
    this.parts.push(Buffer.from(`${text}\n`, "utf8"));
    return this;
  }
  series(name: string, values: readonly number[]): this {
    this.label(name);
    const bytes = Buffer.alloc(8 * values.length);
    values.forEach((v, i) => bytes.writeDoubleLE(v, 8 * i));
    this.parts.push(bytes);
    return this;
  }
  bytes(): Buffer {
    return Buffer.concat(this.parts);
  }
  digest(): string {
    return `sha256:${createHash("sha256").update(this.bytes()).digest("hex")}`;
  }
}

/** RFC 4180 fields of one line (quotes doubled inside quoted fields). */
function csvFields(line: string): string[] {
  const out: string[] = [];
  let i = 0;
  while (i <= line.length) {
    if (line[i] === '"') {
      let text = "";
      i++;
      while (i < line.length) {
        if (line[i] === '"' && line[i + 1] === '"') {
          text += '"';
          i += 2;
        } else if (line[i] === '"') {
          i++;
          break;
        } else text += line[i++];
      }
      out.push(text);
      i++;
    } else {
      const end = line.indexOf(",", i) < 0 ? line.length : line.indexOf(",", i);
      out.push(line.slice(i, end));
      i = end + 1;
    }
  }
  return out;
}

/** The CSV's tables (separated by empty lines), each as rows of fields. */
function csvTables(text: string): string[][][] {
  return text
    .trimEnd()
    .split("\n\n")
    .map((table) => table.split("\n").map(csvFields));
}

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-fingerprint-spec-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function renderCsv(stateFile: string): Promise<string> {
  const out = join(dir, "numbers.csv");
  let err = "";
  const code = await runCliAsync(["render", stateFile, "-o", out, "--strict"], { out: () => undefined, err: (s) => (err += s) });
  expect(err).not.toMatch(/warning|quietframe:/);
  expect(code).toBe(0);
  return readFileSync(out, "utf8");
}

type Doc = { state: Record<string, { state: Record<string, unknown> }> };
const modelState = (doc: Doc): Record<string, unknown> => Object.values(doc.state)[0].state;

describe("docs/fingerprint.md", () => {
  it("its worked example: the bytes listed, and their digest, as Node's crypto computes them", () => {
    const block = /```\n(65 78 61[\s\S]*?)```/.exec(SPEC)?.[1] ?? "";
    const listed = Buffer.from(
      block
        .split("\n")
        .map((line) => line.slice(0, 43).trim())
        .join(" ")
        .split(/\s+/)
        .filter(Boolean)
        .map((h) => Number.parseInt(h, 16)),
    );
    const stated = /sha256:[0-9a-f]{64}/.exec(SPEC.slice(SPEC.indexOf("Their SHA-256 digest")))?.[0];
    const example = new SpecFingerprint().label("example").series("x", [1, -0.5]);
    expect(listed.length).toBe(26);
    expect(example.bytes().equals(listed)).toBe(true);
    expect(example.digest()).toBe(stated);
    // The tool's own writer agrees with the specification.
    expect(
      seriesFingerprint(({ label, series }) => {
        label("example");
        series("x", [1, -0.5]);
      }),
    ).toBe(stated);
  });

  it("an explorer's stored fingerprint, recomputed from the power-density CSV of its example state", { timeout: 60_000 }, async () => {
    const doc = JSON.parse(readFileSync(join(STATES, "explorer-squeezed-membrane.json"), "utf8")) as Doc;
    const state = modelState(doc) as {
      settings: { spectralDensity: string };
      setup: { signal: { referTo: string }; components?: { name: string; params?: { damping?: unknown } }[] };
      fingerprint: string;
    };
    // The spec's recipe: densities as power, a field the fingerprint does not cover.
    state.settings.spectralDensity = "power";
    const file = join(dir, "explorer-power.json");
    writeFileSync(file, JSON.stringify(doc));
    const [[header, ...rows]] = csvTables(await renderCsv(file));
    const column = (k: number): number[] => rows.map((r) => Number(r[k]));
    const unit = /\[(.*)²\/Hz\]$/.exec(header[1])?.[1];
    const f = new SpecFingerprint().label(`quantity ${state.setup.signal.referTo} [${unit}]`).series("frequencies", column(0)).series("total", column(1));
    const references: Record<string, string> = { SQL: "sql", "zero-point motion": "zero-point", "thermal force (quantum FDT)": "thermal" };
    header.slice(2).forEach((name, k) => {
      const label = name.replace(/ \[[^\]]*\]$/, "");
      const id = Object.keys(references).find((prefix) => label.startsWith(prefix));
      // docs/fingerprint.md: a viscously damped body's thermal term is shown as "thermal noise" but hashed under its id "thermal force".
      const damping = (body: string): unknown => state.setup.components?.find((c) => c.name === body)?.params?.damping;
      const viscous = /^(.*): thermal noise$/.exec(label);
      const termId = viscous && damping(viscous[1]) !== "symmetric" ? `${viscous[1]}: thermal force` : label;
      f.series(id ? `reference ${references[id]}` : `term ${termId}`, column(k + 2));
    });
    expect(rows.length).toBe(801);
    expect(f.digest()).toBe(state.fingerprint);
  });

  it("an entangled-light panel's stored fingerprint, recomputed from its CSV alone", { timeout: 60_000 }, async () => {
    const file = join(STATES, "entangled-two-beams.json");
    const stored = modelState(JSON.parse(readFileSync(file, "utf8")) as Doc).fingerprint;
    const [spectrum, summary, covariance, contours] = csvTables(await renderCsv(file));
    const f = new SpecFingerprint().label("quietframe entangled-panel fingerprint 1");
    spectrum[0].forEach((name, k) =>
      f.series(
        name,
        spectrum.slice(1).map((r) => Number(r[k])),
      ),
    );
    for (const [name, value] of summary.slice(1)) f.series(name, [Number(value)]);
    f.series(
      covariance[0][0],
      covariance.slice(1).flatMap((r) => r.slice(1).map(Number)),
    );
    const names = [...new Set(contours.slice(1).map((r) => r[0]))];
    for (const name of names) {
      const points = contours.slice(1).filter((r) => r[0] === name);
      f.series(
        `${name}: X`,
        points.map((r) => Number(r[2])),
      );
      f.series(
        `${name}: P`,
        points.map((r) => Number(r[3])),
      );
    }
    expect(names).toEqual(["vacuum", "arm 1 alone", "arm 2 alone", "arm 1 given X2 of arm 2"]);
    expect(f.digest()).toBe(stored);
  });
  it("a tolerance map's stored fingerprint, recomputed from its CSV alone", { timeout: 60_000 }, async () => {
    const file = join(STATES, "tolerance-squeezing-efficiency.json");
    const state = JSON.parse(readFileSync(file, "utf8")) as { fingerprint: string; map: { values: unknown[]; x: { values: number[] } } };
    const [axes, cells] = csvTables(await renderCsv(file));
    const f = new SpecFingerprint().label("quietframe tolerance-map fingerprint 1");
    // The axes: the non-empty fields of each column; then the figure (an empty field as +0) and the status of each cell in row order.
    axes[0].forEach((name, k) =>
      f.series(
        name,
        axes
          .slice(1)
          .map((r) => r[k])
          .filter((v) => v !== "")
          .map(Number),
      ),
    );
    for (const k of [2, 3])
      f.series(
        cells[0][k],
        cells.slice(1).map((r) => (r[k] === "" ? 0 : Number(r[k]))),
      );
    expect(axes[0]).toEqual(["x: squeezer.squeezing [SI]", "y: detector.efficiency [SI]"]);
    expect(cells[0]).toEqual(["x index", "y index", "figure [dB]", "status [0 ok, 1 unstable, 2 invalid]"]);
    expect(cells.length - 1).toBe(state.map.values.length);
    expect(f.digest()).toBe(state.fingerprint);
  });
});
