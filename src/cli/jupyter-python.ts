/**
 * Which Python runs the user's Jupyter: `quietframe kernel install` and `quietframe extension
 * install` register with that Python's Jupyter, so they must find it without being told.
 */
import { spawnSync } from "node:child_process";
import { closeSync, existsSync, openSync, readSync, statSync } from "node:fs";
import { delimiter, dirname, isAbsolute, join } from "node:path";
import { QuietframeError } from "../errors";

/** A Python that has Jupyter (jupyter_core and jupyter_client), as it describes itself. */
export interface JupyterPython {
  /** What was run: a path, or a command name looked up on PATH. */
  readonly command: string;
  /** How it was found, e.g. "the first line of /usr/bin/jupyter". */
  readonly source: string;
  /** sys.prefix: where its environment's share/jupyter is. */
  readonly prefix: string;
  /** Jupyter's per-user data directory (JUPYTER_DATA_DIR when set). */
  readonly userDataDir: string;
}

/** One interpreter tried and why it was refused. */
export interface RefusedPython {
  readonly command: string;
  readonly source: string;
  readonly reason: string;
}

export interface FindPythonOptions {
  /** The user's --python: then only this one is tried. */
  python?: string;
  /** Environment for the lookup (PATH, VIRTUAL_ENV) and for running the interpreters. */
  env?: NodeJS.ProcessEnv;
}

// Prints what the install commands need, or which Jupyter module is missing.
const PROBE_PY = `
import json, sys
out = {"prefix": sys.prefix}
try:
    import jupyter_client
    from jupyter_core.paths import jupyter_data_dir
    out["user_data_dir"] = jupyter_data_dir()
except ImportError as e:
    out["missing"] = e.name or str(e)
print("quietframe-probe " + json.dumps(out))
`;

const isWindows = process.platform === "win32";

/** An executable file named `name` in one of PATH's folders. */
function onPath(name: string, env: NodeJS.ProcessEnv): string | undefined {
  const names = isWindows ? [name, `${name}.exe`] : [name];
  for (const dir of (env.PATH ?? "").split(delimiter).filter(Boolean)) {
    for (const n of names) {
      const p = join(dir, n);
      try {
        if (statSync(p).isFile()) return p;
      } catch {
        // Not in this folder.
      }
    }
  }
  return undefined;
}

function firstLines(file: string, bytes = 512): string[] {
  const fd = openSync(file, "r");
  try {
    const buffer = Buffer.alloc(bytes);
    const n = readSync(fd, buffer, 0, bytes, 0);
    return buffer.subarray(0, n).toString("utf8").split("\n");
  } finally {
    closeSync(fd);
  }
}

/**
 * The interpreter a `jupyter` script runs on, from its first line: `#!/path/python`,
 * `#!/usr/bin/env python3`, or pip's form for long paths (`#!/bin/sh` and then
 * `'''exec' "/path/python" "$0" "$@"`). A string when it names none.
 */
export function interpreterOfScript(file: string, env: NodeJS.ProcessEnv): { python: string } | { refused: string } {
  let lines: string[];
  try {
    lines = firstLines(file);
  } catch (e) {
    return { refused: `cannot be read (${(e as NodeJS.ErrnoException).code ?? String(e)})` };
  }
  const [first = "", second = ""] = lines;
  if (!first.startsWith("#!")) return { refused: "is not a script whose first line names its interpreter" };
  const words = first.slice(2).trim().split(/\s+/);
  const pipExec = /^'''exec' "([^"]+)" "\$0"/.exec(second.trim());
  if (pipExec) return { python: pipExec[1] };
  const [program = "", arg = ""] = words;
  const name = program.endsWith("/env") ? arg : program;
  if (!/python[\d.]*$/.test(name.split("/").pop() ?? "")) return { refused: `runs on ${JSON.stringify(first.trim())}, which is no Python` };
  if (isAbsolute(name)) return { python: name };
  const found = onPath(name, env);
  return found ? { python: found } : { refused: `names ${name}, which is not on PATH` };
}

/** Runs the probe in `command`; the Python's answer or why it is refused. */
function probe(command: string, env: NodeJS.ProcessEnv): { prefix: string; userDataDir: string } | { refused: string } {
  const run = spawnSync(command, ["-c", PROBE_PY], { env, encoding: "utf8", timeout: 60_000 });
  if (run.error) return { refused: `cannot be started (${(run.error as NodeJS.ErrnoException).code ?? run.error.message})` };
  const line = (run.stdout ?? "").split("\n").find((l) => l.startsWith("quietframe-probe "));
  if (run.status !== 0 || !line) {
    const said = (run.stderr ?? "").trim().split("\n").slice(-1)[0];
    return { refused: `did not run a Python 3 script (exit status ${run.status ?? run.signal}${said ? `: ${said}` : ""})` };
  }
  const answer = JSON.parse(line.slice("quietframe-probe ".length)) as { prefix: string; user_data_dir?: string; missing?: string };
  if (answer.missing !== undefined || answer.user_data_dir === undefined) return { refused: `has no ${answer.missing ?? "jupyter_core"} (Jupyter is not installed for it)` };
  return { prefix: answer.prefix, userDataDir: answer.user_data_dir };
}

/** The interpreters to try, in order, each with how it was found; scripts that name none are refused on the way. */
function candidates(options: FindPythonOptions, env: NodeJS.ProcessEnv, refused: RefusedPython[]): { command: string; source: string }[] {
  if (options.python !== undefined) return [{ command: options.python, source: "--python" }];
  const list: { command: string; source: string }[] = [];
  const jupyter = onPath("jupyter", env);
  if (jupyter) {
    const found = interpreterOfScript(jupyter, env);
    if ("python" in found) list.push({ command: found.python, source: `the first line of ${jupyter}` });
    else if (isWindows && existsSync(join(dirname(jupyter), "..", "python.exe"))) list.push({ command: join(dirname(jupyter), "..", "python.exe"), source: `beside ${jupyter}` });
    else refused.push({ command: jupyter, source: "jupyter on PATH", reason: found.refused });
  } else {
    refused.push({ command: "jupyter", source: "PATH", reason: "is not on PATH" });
  }
  if (env.VIRTUAL_ENV) list.push({ command: join(env.VIRTUAL_ENV, isWindows ? "Scripts" : "bin", isWindows ? "python.exe" : "python"), source: "VIRTUAL_ENV" });
  list.push({ command: "python3", source: "the fallback" });
  return list;
}

/**
 * The Python whose Jupyter the install commands register with: the one given with --python,
 * else the interpreter of the `jupyter` command on PATH, else the active virtual
 * environment's, else `python3`. Each must import jupyter_core and jupyter_client. When none
 * does, the error names every interpreter tried and why each was refused.
 */
export function findJupyterPython(options: FindPythonOptions = {}): JupyterPython {
  const env = options.env ?? process.env;
  const refused: RefusedPython[] = [];
  const seen = new Set<string>();
  for (const c of candidates(options, env, refused)) {
    if (seen.has(c.command)) continue;
    seen.add(c.command);
    const answer = probe(c.command, env);
    if ("refused" in answer) refused.push({ ...c, reason: answer.refused });
    else return { ...c, ...answer };
  }
  const tried = refused.map((r) => `${r.command} (${r.source}) ${r.reason}`).join("; ");
  if (options.python !== undefined) {
    throw new QuietframeError({
      path: "--python",
      value: options.python,
      problem: refused[0]?.reason ?? "was refused",
      allowed: "the Python your Jupyter runs on, with jupyter_client (e.g. the one named in the first line of the jupyter command)",
    });
  }
  throw new QuietframeError({
    path: "--python",
    value: "(not given)",
    problem: `no Python with Jupyter was found; tried: ${tried}`,
    allowed: "--python PATH naming the Python your Jupyter runs on (the first line of the jupyter command names it), or activate its virtual environment",
  });
}
