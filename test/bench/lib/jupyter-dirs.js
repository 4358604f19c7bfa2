"use strict";
/** A private set of Jupyter directories for a benchmark's kernel (never the user's own Jupyter). */
const { existsSync, mkdirSync, mkdtempSync, rmSync } = require("node:fs");
const { tmpdir } = require("node:os");
const { delimiter, dirname, join } = require("node:path");

const SYSTEM_PYTHON = "/usr/bin/python3";

/**
 * A temporary directory with a Jupyter prefix, config, data, runtime and IPython directories,
 * and the environment that points Jupyter at them (as test/jupyter/env.ts does for the suites).
 * The caller installs its kernel into `prefix` and calls `dispose` when done.
 */
function privateJupyterDirs(label) {
  if (!existsSync(SYSTEM_PYTHON)) throw new Error(`${SYSTEM_PYTHON} is missing (Debian Jupyter packages; scripts/ensure-system-deps.sh installs them)`);
  const dir = mkdtempSync(join(tmpdir(), label));
  const sub = (name) => {
    const p = join(dir, name);
    mkdirSync(p, { recursive: true });
    return p;
  };
  const prefix = sub("prefix");
  const env = {
    ...process.env,
    // Kernel specs start `#!/usr/bin/env node` scripts, so node must be found.
    PATH: [dirname(process.execPath), process.env.PATH ?? ""].filter(Boolean).join(delimiter),
    JUPYTER_PATH: join(prefix, "share", "jupyter"),
    JUPYTER_CONFIG_DIR: sub("config"),
    JUPYTER_DATA_DIR: sub("data"),
    JUPYTER_RUNTIME_DIR: sub("runtime"),
    IPYTHONDIR: sub("ipython"),
    PYDEVD_DISABLE_FILE_VALIDATION: "1",
    NO_COLOR: "1",
  };
  delete env.JUPYTER_PREFER_ENV_PATH;
  return { dir, prefix, env, dispose: () => rmSync(dir, { recursive: true, force: true }) };
}

module.exports = { SYSTEM_PYTHON, privateJupyterDirs };
