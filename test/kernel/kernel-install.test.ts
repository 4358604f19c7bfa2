import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { delimiter, dirname, join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli/run";
import { REPO_ROOT, SYSTEM_PYTHON } from "../jupyter/env";
import { createQuietframeKernelEnv, type QuietframeKernelEnv } from "./kernel-env";

// `quietframe kernel install` registers the kernel through jupyter_client's
// KernelSpecManager; Jupyter itself (Debian's jupyter_client) must then list it. Only
// private prefixes here, never the user's own Jupyter.

const BUILT_CLI = join(REPO_ROOT, "dist", "src", "cli", "main.js");

describe("quietframe kernel install", () => {
  let env: QuietframeKernelEnv;
  let prefix: string;

  beforeAll(() => {
    env = createQuietframeKernelEnv(); // private JUPYTER_* directories
    prefix = mkdtempSync(join(tmpdir(), "quietframe-prefix-"));
  });

  afterAll(() => {
    env?.dispose();
    rmSync(prefix, { recursive: true, force: true });
  });

  it("installs into --prefix, and Jupyter lists it with our name, display name and launcher", () => {
    const r = spawnSync(process.execPath, [BUILT_CLI, "kernel", "install", "--prefix", prefix, "--python", SYSTEM_PYTHON], { env: env.env, encoding: "utf8" });
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^Installed the TypeScript \(quietframe\) kernel spec \(quietframe-ts\) in .*quietframe-ts\n$/);
    const listed = spawnSync(SYSTEM_PYTHON, ["-c", "import json; from jupyter_client.kernelspec import KernelSpecManager; print(json.dumps(KernelSpecManager().get_all_specs()))"], {
      env: { ...env.env, JUPYTER_PATH: join(prefix, "share", "jupyter") },
      encoding: "utf8",
    });
    const specs = JSON.parse(listed.stdout) as Record<string, { spec: { argv: string[]; display_name: string; language: string; interrupt_mode: string } }>;
    const spec = specs["quietframe-ts"].spec;
    expect(spec.display_name).toBe("TypeScript (quietframe)");
    expect(spec.language).toBe("typescript");
    expect(spec.interrupt_mode).toBe("signal");
    expect(spec.argv.slice(2)).toEqual(["--config-path", "{connection_file}"]);
    expect(spec.argv[0]).toBe(process.execPath);
    expect(existsSync(spec.argv[1])).toBe(true);
    expect(spec.argv[1]).toMatch(/dist[\\/]widgets[\\/]kernel[\\/]launch\.js$/);
  });

  it("without --python, registers with the Python that runs the jupyter command on PATH", () => {
    // Debian's /usr/bin/jupyter is a script whose first line names /usr/bin/python3, the
    // interpreter its jupyter_client is installed for (another python3 may come first on PATH).
    const other = mkdtempSync(join(tmpdir(), "quietframe-prefix-"));
    try {
      const path = [dirname(process.execPath), dirname(SYSTEM_PYTHON)].join(delimiter);
      const r = spawnSync(process.execPath, [BUILT_CLI, "kernel", "install", "--prefix", other], { env: { ...env.env, PATH: path, VIRTUAL_ENV: "" }, encoding: "utf8" });
      expect(r.stderr).toBe("");
      expect(r.status).toBe(0);
      expect(existsSync(join(other, "share", "jupyter", "kernels", "quietframe-ts", "kernel.json"))).toBe(true);
    } finally {
      rmSync(other, { recursive: true, force: true });
    }
  });

  it("refuses --user together with --prefix", () => {
    const err: string[] = [];
    const code = runCli(["kernel", "install", "--user", "--prefix", prefix], { out: () => undefined, err: (s) => err.push(s) });
    expect(code).toBe(1);
    expect(err.join("")).toContain("--prefix");
    expect(err.join("")).toContain("cannot be combined with --user");
  });

  it("names the --python that cannot be started", () => {
    const err: string[] = [];
    const code = runCli(["kernel", "install", "--prefix", prefix, "--python", join(prefix, "no-python-here")], { out: () => undefined, err: (s) => err.push(s) });
    expect(code).toBe(1);
    expect(err.join("")).toMatch(/--python = ".*no-python-here": cannot be started \(ENOENT\)/);
  });

  it("refuses an unknown kernel subcommand", () => {
    const err: string[] = [];
    expect(runCli(["kernel", "uninstall"], { out: () => undefined, err: (s) => err.push(s) })).toBe(1);
    expect(err.join("")).toBe('quietframe: kernel = "uninstall": is not a kernel subcommand (did you mean "install"?); allowed: install\n');
  });
});
