import { execFile } from "node:child_process";
import { readFileSync } from "node:fs";
import { basename, join } from "node:path";
import { SYSTEM_PYTHON, type JupyterEnv } from "./env";

/** The parts of an nbformat-4 notebook the tests read. */
export interface NotebookOutput {
  output_type: string;
  name?: string;
  text?: string | string[];
  data?: Record<string, unknown>;
  metadata?: Record<string, unknown>;
  ename?: string;
  evalue?: string;
}

export interface NotebookCell {
  cell_type: string;
  source: string | string[];
  outputs?: NotebookOutput[];
}

export interface Notebook {
  nbformat: number;
  metadata: Record<string, unknown>;
  cells: NotebookCell[];
}

/** nbformat stores multi-line text either as one string or as a list of lines. */
export function joined(text: unknown): string {
  return Array.isArray(text) ? text.join("") : typeof text === "string" ? text : "";
}

export interface RunResult {
  code: number | null;
  stdout: string;
  stderr: string;
  ms: number;
}

export function run(command: string, args: string[], options: { env: NodeJS.ProcessEnv; cwd?: string; timeoutMs: number }): Promise<RunResult> {
  const start = Date.now();
  return new Promise((resolve) => {
    execFile(command, args, { env: options.env, cwd: options.cwd, timeout: options.timeoutMs, maxBuffer: 64 * 1024 * 1024 }, (error, stdout, stderr) => {
      const code = error ? (typeof error.code === "number" ? error.code : null) : 0;
      resolve({ code, stdout: String(stdout), stderr: String(stderr), ms: Date.now() - start });
    });
  });
}

export interface ExecutedNotebook {
  run: RunResult;
  /** On failure: what the cells wrote to stderr (tslab reports errors there, and nbconvert's own message is empty). */
  cellErrors?: string;
  /** Path of the executed copy (in the output directory). */
  file: string;
  notebook?: Notebook;
}

/** Executes a notebook headless with Debian's nbconvert in the private Jupyter environment. */
export async function executeNotebook(jupyter: JupyterEnv, source: string, outDir: string, timeoutMs: number): Promise<ExecutedNotebook> {
  const nbconvert = (name: string, extra: string[]): Promise<RunResult> =>
    run(
      SYSTEM_PYTHON,
      [
        "-m",
        "nbconvert",
        "--to",
        "notebook",
        "--execute",
        "--ExecutePreprocessor.kernel_name=tslab",
        `--ExecutePreprocessor.timeout=${Math.round(timeoutMs / 1000)}`,
        ...extra,
        source,
        "--output",
        name,
        "--output-dir",
        outDir,
      ],
      { env: jupyter.env, timeoutMs },
    );
  const name = basename(source);
  const file = join(outDir, name);
  const result = await nbconvert(name, []);
  if (result.code === 0) return { run: result, file, notebook: JSON.parse(readFileSync(file, "utf8")) as Notebook };
  // Run again, keeping going past errors, only to say which cell failed and why.
  const diagnosticName = name.replace(/\.ipynb$/, ".diagnostic.ipynb");
  const again = await nbconvert(diagnosticName, ["--allow-errors"]);
  let cellErrors: string | undefined;
  if (again.code === 0) {
    const nb = JSON.parse(readFileSync(join(outDir, diagnosticName), "utf8")) as Notebook;
    cellErrors = nb.cells
      .map((c, i) => ({
        i,
        err: (c.outputs ?? [])
          .filter((o) => o.output_type === "error" || o.name === "stderr")
          .map((o) => joined(o.text) || `${o.ename}: ${o.evalue}`)
          .join(""),
      }))
      .filter((c) => c.err)
      .map((c) => `cell ${c.i}: ${c.err}`)
      .join("\n");
  }
  return { run: result, file, cellErrors };
}

/** Checks a notebook file against the nbformat schema with Debian's nbformat (an outside reference). */
export function validateWithNbformat(jupyter: JupyterEnv, file: string): Promise<RunResult> {
  return run(SYSTEM_PYTHON, ["-c", "import nbformat, sys; nbformat.validate(nbformat.read(sys.argv[1], as_version=4)); print('valid')", file], { env: jupyter.env, timeoutMs: 60_000 });
}

export function outputsOf(nb: Notebook): NotebookOutput[] {
  return nb.cells.flatMap((c) => c.outputs ?? []);
}
