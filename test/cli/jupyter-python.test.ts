import { chmodSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { delimiter, join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { findJupyterPython, interpreterOfScript } from "../../src/cli/jupyter-python";
import { QuietframeError } from "../../src/errors";

// How the install commands find Jupyter's Python. The interpreters here are small shell
// scripts standing in for Pythons (the finder only runs them and reads what they print), so
// the order of the search and every refusal can be checked without any real Python. The
// script forms are those the Python packaging tools write (common practice, no source):
// `#!/abs/python`, `#!/usr/bin/env python3`, and pip's `#!/bin/sh` + `'''exec' "…" "$0" "$@"`.

let dir: string;

/** An executable in dir/<folder>/<name> with the given text. */
function executable(folder: string, name: string, text: string): string {
  mkdirSync(join(dir, folder), { recursive: true });
  const p = join(dir, folder, name);
  writeFileSync(p, text);
  chmodSync(p, 0o755);
  return p;
}

/** A stand-in Python that answers the probe as a Python with Jupyter in `prefix` would. */
function jupyterPython(folder: string, prefix: string, name = "python3"): string {
  return executable(folder, name, `#!/bin/sh\necho 'quietframe-probe {"prefix": "${prefix}", "user_data_dir": "${prefix}/user-data"}'\n`);
}

/** A stand-in Python without jupyter_client. */
function barePython(folder: string): string {
  return executable(folder, "python3", `#!/bin/sh\necho 'quietframe-probe {"prefix": "/bare", "missing": "jupyter_client"}'\n`);
}

function env(pathFolders: string[], extra: NodeJS.ProcessEnv = {}): NodeJS.ProcessEnv {
  // Only the test's folders: the stand-ins name /bin/sh by its full path, and this machine's own Pythons stay out of reach.
  return { PATH: pathFolders.map((f) => join(dir, f)).join(delimiter), ...extra };
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-find-python-"));
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe("the Python a jupyter script runs on", () => {
  it("reads an absolute interpreter, env with a name on PATH, and pip's exec form for long paths", () => {
    const py = jupyterPython("env-bin", "/env");
    const e = env(["env-bin"]);
    expect(interpreterOfScript(executable("s1", "jupyter", "#!/opt/tools/bin/python3.11\nimport sys\n"), e)).toEqual({ python: "/opt/tools/bin/python3.11" });
    expect(interpreterOfScript(executable("s2", "jupyter", "#!/usr/bin/env python3\n"), e)).toEqual({ python: py });
    expect(interpreterOfScript(executable("s3", "jupyter", `#!/bin/sh\n'''exec' "/very/long/path/bin/python" "$0" "$@"\n' '''\n`), e)).toEqual({ python: "/very/long/path/bin/python" });
  });

  it("refuses a script that runs on something else, or names a Python that is not on PATH", () => {
    const e = env([]);
    expect(interpreterOfScript(executable("s4", "jupyter", "#!/usr/bin/env bash\nexec pyenv exec jupyter\n"), e)).toEqual({ refused: 'runs on "#!/usr/bin/env bash", which is no Python' });
    expect(interpreterOfScript(executable("s5", "jupyter", "#!/usr/bin/env python3.99\n"), e)).toEqual({ refused: "names python3.99, which is not on PATH" });
    expect(interpreterOfScript(executable("s6", "jupyter", "\x7fELF binary"), e)).toEqual({ refused: "is not a script whose first line names its interpreter" });
  });
});

describe("findJupyterPython", () => {
  it("takes the interpreter of the jupyter command on PATH before the virtual environment and python3", () => {
    const lab = jupyterPython("lab-env", "/lab-env");
    executable("lab-cmd", "jupyter", `#!${lab}\n`);
    jupyterPython("venv/bin", "/venv", "python");
    jupyterPython("first", "/first");
    const found = findJupyterPython({ env: env(["first", "lab-cmd"], { VIRTUAL_ENV: join(dir, "venv") }) });
    expect(found).toEqual({ command: lab, source: `the first line of ${join(dir, "lab-cmd", "jupyter")}`, prefix: "/lab-env", userDataDir: "/lab-env/user-data" });
  });

  it("takes the active virtual environment's Python when the jupyter command's is refused", () => {
    const bare = barePython("bare");
    executable("bare-cmd", "jupyter", `#!${bare}\n`);
    const venv = jupyterPython("venv2/bin", "/venv2", "python");
    const found = findJupyterPython({ env: env(["bare-cmd"], { VIRTUAL_ENV: join(dir, "venv2") }) });
    expect(found).toMatchObject({ command: venv, source: "VIRTUAL_ENV", prefix: "/venv2" });
  });

  it("falls back to python3 on PATH", () => {
    jupyterPython("only-python", "/plain");
    expect(findJupyterPython({ env: env(["only-python"]) })).toMatchObject({ command: "python3", source: "the fallback", prefix: "/plain" });
  });

  it("names every interpreter it tried and why each was refused", () => {
    const bare = barePython("bare2");
    executable("bare2-cmd", "jupyter", `#!${bare}\n`);
    const venv = join(dir, "no-such-venv");
    let error: unknown;
    try {
      findJupyterPython({ env: env(["bare2-cmd", "bare2"], { VIRTUAL_ENV: venv }) });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(QuietframeError);
    const e = error as QuietframeError;
    expect(e.path).toBe("--python");
    expect(e.problem).toBe(
      `no Python with Jupyter was found; tried: ${bare} (the first line of ${join(dir, "bare2-cmd", "jupyter")}) has no jupyter_client (Jupyter is not installed for it); ` +
        `${join(venv, "bin", "python")} (VIRTUAL_ENV) cannot be started (ENOENT); python3 (the fallback) has no jupyter_client (Jupyter is not installed for it)`,
    );
    expect(e.allowed).toMatch(/^--python PATH/);
  });

  it("without a jupyter command, says so among the refusals", () => {
    expect(() => findJupyterPython({ env: env([]) })).toThrow(/tried: jupyter \(PATH\) is not on PATH; python3 \(the fallback\) cannot be started \(ENOENT\)/);
  });

  it("tries only the --python it is given, and names it when refused", () => {
    const bare = barePython("bare3");
    jupyterPython("other", "/other");
    expect(() => findJupyterPython({ python: bare, env: env(["other"]) })).toThrow(
      `--python = ${JSON.stringify(bare.length > 80 ? `${bare.slice(0, 77)}...` : bare)}: has no jupyter_client (Jupyter is not installed for it)`,
    );
    const notPython = executable("np", "python3", "#!/bin/sh\necho 'not a python' >&2\nexit 2\n");
    expect(() => findJupyterPython({ python: notPython, env: env([]) })).toThrow(/did not run a Python 3 script \(exit status 2: not a python\)/);
  });
});
