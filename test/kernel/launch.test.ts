import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { parseLaunchArgs } from "../../widgets/kernel/launch";
import { launcherPath } from "../../widgets/kernel/kernel-spec";

describe("parseLaunchArgs", () => {
  it("reads the connection file Jupyter passes, in either spelling", () => {
    expect(parseLaunchArgs(["--config-path", "/x/kernel-1.json"])).toEqual({ configPath: "/x/kernel-1.json" });
    expect(parseLaunchArgs(["--config-path=/x/k.json"])).toEqual({ configPath: "/x/k.json" });
    expect(() => parseLaunchArgs([])).toThrow("--config-path <connection file> is required");
  });
});

describe("the launcher", () => {
  const started: ChildProcess[] = [];
  const dirs: string[] = [];
  afterEach(() => {
    for (const p of started) if (p.exitCode === null && p.signalCode === null) p.kill("SIGKILL");
    for (const d of dirs) rmSync(d, { recursive: true, force: true });
  });

  function exited(p: ChildProcess, ms: number): Promise<boolean> {
    if (p.exitCode !== null) return Promise.resolve(true);
    return new Promise((resolve) => {
      const t = setTimeout(() => resolve(false), ms);
      p.once("exit", () => {
        clearTimeout(t);
        resolve(true);
      });
    });
  }

  it("ends when the process named in JPY_PARENT_PID ends (no orphan kernels)", async () => {
    const dir = mkdtempSync(join(tmpdir(), "quietframe-launch-"));
    dirs.push(dir);
    // ipc transport: sockets are files in the temp dir, no TCP ports to collide on.
    const conn = {
      transport: "ipc",
      ip: join(dir, "k"),
      shell_port: 1,
      iopub_port: 2,
      stdin_port: 3,
      control_port: 4,
      hb_port: 5,
      key: "k",
      signature_scheme: "hmac-sha256",
      kernel_name: "quietframe-ts",
    };
    writeFileSync(join(dir, "conn.json"), JSON.stringify(conn));
    const parent = spawn(process.execPath, ["-e", "setTimeout(() => {}, 60000)"], { stdio: "ignore" });
    started.push(parent);
    let log = "";
    const kernel = spawn(process.execPath, [launcherPath(), "--config-path", join(dir, "conn.json")], {
      cwd: dir,
      env: { ...process.env, JPY_PARENT_PID: String(parent.pid) },
      stdio: ["ignore", "ignore", "pipe"],
    });
    started.push(kernel);
    kernel.stderr!.on("data", (d: Buffer) => (log += d.toString()));
    await new Promise<void>((resolve, reject) => {
      const t = setTimeout(() => reject(new Error(`kernel did not start: ${log}`)), 30_000);
      kernel.stderr!.on("data", () => {
        if (log.includes("started (pid")) {
          clearTimeout(t);
          resolve();
        }
      });
    });
    expect(await exited(kernel, 1500)).toBe(false); // alive while its parent is
    parent.kill("SIGKILL");
    expect(await exited(kernel, 15_000)).toBe(true);
    expect(kernel.exitCode).toBe(0);
    expect(log).toContain(`parent process ${parent.pid} is gone; shutting down`);
  }, 60_000);
});
