import { mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli/run";
import { COMPONENT_KINDS } from "../../src/components/registry";
import { BAD_CASES, MALFORMED_CASES, freeMassSetup } from "../setup/fixtures";

const ROOT = join(__dirname, "..", "..");
const EXAMPLES = join(ROOT, "examples");
// Test names use the bare file name; the CLI gets the full path, whatever the working directory.
const EXAMPLE_NAMES = readdirSync(EXAMPLES).filter((f) => f.endsWith(".json"));
const EXAMPLE_FILES = EXAMPLE_NAMES.map((f) => join(EXAMPLES, f));

function cli(...argv: string[]): { code: number; out: string; err: string } {
  let out = "";
  let err = "";
  const code = runCli(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

let dir: string;
let fileCount = 0;
function writeTemp(text: string): string {
  const path = join(dir, `setup-${++fileCount}.json`);
  writeFileSync(path, text);
  return path;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-cli-"));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

/** RFC 4180 records; header labels may be quoted, numbers never are. */
function parseCsv(text: string): string[][] {
  expect(text.endsWith("\n")).toBe(true);
  return text.slice(0, -1).split("\n").map(splitCsvLine);
}

function splitCsvLine(line: string): string[] {
  const cells: string[] = [];
  let i = 0;
  for (;;) {
    if (line[i] === '"') {
      let cell = "";
      let j = i + 1;
      for (;;) {
        const q = line.indexOf('"', j);
        if (q < 0) throw new Error(`unterminated quote in ${line}`);
        cell += line.slice(j, q);
        if (line[q + 1] !== '"') {
          i = q + 1;
          break;
        }
        cell += '"';
        j = q + 2;
      }
      cells.push(cell);
    } else {
      const comma = line.indexOf(",", i);
      const end = comma < 0 ? line.length : comma;
      cells.push(line.slice(i, end));
      i = end;
    }
    if (i >= line.length) return cells;
    if (line[i] !== ",") throw new Error(`text after a quoted field in ${line}`);
    i++;
  }
}

describe("bad set-ups: exit 1, nothing on stdout, the message on stderr", () => {
  for (const c of BAD_CASES) {
    it.each(["eval", "check"])(`${c.label} (%s)`, (command) => {
      const r = cli(command, writeTemp(c.text));
      expect(r.code).toBe(1);
      expect(r.out).toBe("");
      expect(r.err.startsWith("quietframe: ")).toBe(true);
      for (const part of c.contains) expect(r.err).toContain(part);
    });
  }

  for (const c of MALFORMED_CASES) {
    it(`malformed JSON, ${c.label}`, () => {
      const file = writeTemp(c.text);
      const r = cli("eval", file);
      expect(r.code).toBe(1);
      expect(r.out).toBe("");
      expect(r.err).toContain(`${file}: malformed JSON at line ${c.line}, column ${c.column}`);
    });
  }

  it("a file that does not exist", () => {
    const r = cli("eval", join(dir, "no-such-file.json"));
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain("cannot be read (ENOENT)");
  });

  it("no file at all", () => {
    const r = cli("eval");
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain("no set-up file given");
  });

  it.each([
    [["--from", "0 Hz"], '--from = "0 Hz"', "allowed: from > 0 Hz"],
    [["--from", "1 kHz", "--to", "10 Hz"], '--to = "10 Hz"', "allowed: to > from"],
    [["--from=-10 Hz"], '--from = "-10 Hz"', "allowed: from > 0 Hz"],
    [["--to", "40 kg"], '--to = "40 kg"', 'unit "kg" is a mass, but this field is a frequency'],
    [["--points", "1"], '--points = "1"', "an integer from 2 to"],
    [["--points", "seven"], '--points = "seven"', "an integer from 2 to"],
    [["--format", "xml"], '--format = "xml"', "allowed: csv or json"],
  ])("bad options %j", (options, ...parts) => {
    const r = cli("eval", EXAMPLE_FILES[0], ...options);
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    for (const part of parts) expect(r.err).toContain(part);
  });

  it("an unknown option is refused with our own message naming the nearest option (exit 1)", () => {
    const r = cli("eval", EXAMPLE_FILES[0], "--frm", "10 Hz");
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain('quietframe: --frm: is not an option of quietframe eval (did you mean "--from"?); allowed: --from, --to, --points, --format, --psd');
    expect(r.err).not.toMatch(/Unknown option|positional argument/);
  });

  it('a negative value given as a separate argument (`--from "-10 Hz"`) is an error, not a crash', () => {
    // Node's parseArgs refuses option values that start with a dash; the CLI must still answer.
    const r = cli("eval", EXAMPLE_FILES[0], "--from", "-10 Hz");
    expect([1, 2]).toContain(r.code);
    expect(r.out).toBe("");
    expect(r.err).toContain("--from");
  });

  it("an unknown command is a usage error (exit 2)", () => {
    const r = cli("evaluate", EXAMPLE_FILES[0]);
    expect(r.code).toBe(2);
    expect(r.out).toBe("");
    expect(r.err).toContain("unknown command 'evaluate'");
  });

  it("an unknown type name for `types`", () => {
    const r = cli("types", "black-hole");
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain('type = "black-hole": is not a known component type');
  });
});

describe("good set-ups", () => {
  it("there are examples", () => {
    expect(EXAMPLE_NAMES.length).toBeGreaterThan(0);
  });

  it.each(EXAMPLE_NAMES)("`check` accepts %s", (name) => {
    const file = join(EXAMPLES, name);
    const r = cli("check", file);
    expect(r.code, r.err).toBe(0);
    expect(r.err).toBe("");
    expect(r.out).toContain(`${file}: valid quietframe set-up`);
  });

  it.each(EXAMPLE_NAMES)("`eval --format json` of %s: finite numbers, Hz, total and sql columns", (name) => {
    const file = join(EXAMPLES, name);
    const r = cli("eval", file, "--format", "json", "--points", "25");
    expect(r.code, r.err).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc.frequencies.unit).toBe("Hz");
    expect(doc.frequencies.values).toHaveLength(25);
    const f: number[] = doc.frequencies.values;
    expect(f.every((x, i) => Number.isFinite(x) && (i === 0 || x > f[i - 1]))).toBe(true);
    const ids = doc.columns.map((c: { id: string }) => c.id);
    expect(ids[0]).toBe("total");
    expect(ids).toContain("sql");
    expect(doc.unit).toMatch(/\/√Hz$/);
    for (const column of doc.columns) {
      expect(column.values, column.id).toHaveLength(25);
      expect(
        column.values.every((v: unknown) => typeof v === "number" && Number.isFinite(v) && v >= 0),
        `${column.id}: ${JSON.stringify(column.values)}`,
      ).toBe(true);
    }
  });

  it.each(EXAMPLE_NAMES)("`eval --format csv` of %s: units in brackets in the header, numbers below", (name) => {
    const file = join(EXAMPLES, name);
    const r = cli("eval", file, "--format", "csv", "--points", "9");
    expect(r.code, r.err).toBe(0);
    const [header, ...rows] = parseCsv(r.out);
    expect(header[0]).toBe("frequency [Hz]");
    expect(header[1]).toMatch(/^total \[[^\]]+\/√Hz\]$/);
    for (const h of header) expect(h).toMatch(/ \[[^\]]+\]$/);
    expect(rows).toHaveLength(9);
    for (const row of rows) {
      expect(row).toHaveLength(header.length);
      for (const cell of row) expect(Number.isFinite(Number(cell)), cell).toBe(true);
    }
  });

  it("`--psd` switches the unit to a power spectral density", () => {
    const r = cli("eval", EXAMPLE_FILES[0], "--psd", "--points", "3");
    expect(r.code, r.err).toBe(0);
    expect(parseCsv(r.out)[0][1]).toMatch(/^total \[[^\]]+²\/Hz\]$/);
  });

  it('`--points 7 --from "10 Hz" --to "1 kHz"` gives 7 rows from exactly 10 to exactly 1000', () => {
    const r = cli("eval", writeTemp(JSON.stringify(freeMassSetup())), "--points", "7", "--from", "10 Hz", "--to", "1 kHz");
    expect(r.code, r.err).toBe(0);
    const rows = parseCsv(r.out).slice(1);
    expect(rows).toHaveLength(7);
    expect(Number(rows[0][0])).toBe(10);
    expect(Number(rows[6][0])).toBe(1000);
    // Log spacing: 10^(1 + k/3), checked against the decade points that are exact.
    expect(Number(rows[3][0])).toBe(100);
  });

  it("`types` lists every registered type, one per line", () => {
    const r = cli("types");
    expect(r.code).toBe(0);
    const lines = r.out.trimEnd().split("\n");
    expect(lines).toHaveLength(COMPONENT_KINDS.size);
    expect(lines.map((l) => l.split(/\s+/)[0])).toEqual([...COMPONENT_KINDS.keys()]);
  });

  it("`types cavity` lists its parameters and ports", () => {
    const r = cli("types", "cavity");
    expect(r.code).toBe(0);
    expect(r.err).toBe("");
    const kind = COMPONENT_KINDS.get("cavity")!;
    for (const p of kind.params) expect(r.out).toMatch(new RegExp(`^  ${p.name} `, "m"));
    for (const p of kind.ports) expect(r.out).toMatch(new RegExp(`^  ${p.name} +${p.kind}`, "m"));
    expect(r.out).toMatch(/^ {2}linewidth +frequency \(required\)$/m);
    expect(r.out).toMatch(/^ {2}detuning +frequency \(default "0 Hz"\)$/m);
  });

  it("`--version` prints a version and nothing else", () => {
    const r = cli("--version");
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^\d+\.\d+\.\d+\S*\n$/);
    expect(r.err).toBe("");
  });
});
