import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { createServer } from "node:net";
import { SYSTEM_PYTHON, type JupyterEnv } from "../../jupyter/env";

/**
 * A Jupyter server (Debian's classic notebook server, or JupyterLab from the pinned
 * environment), started for one test on 127.0.0.1 with a random token
 * and the private Jupyter environment, and stopped by that test (SIGTERM to its PID; the
 * server shuts its kernels down with it).
 */
export interface NotebookServer {
  readonly pid: number;
  readonly port: number;
  readonly token: string;
  /** http://127.0.0.1:<port> */
  readonly origin: string;
  /** What the server printed so far (the end of it), for failure messages. */
  output(): string;
  /** True once the process has exited. */
  exited(): boolean;
  /** SIGTERM, then a bounded wait for the exit (SIGKILL if it does not come). Idempotent. */
  stop(): Promise<{ code: number | null; signal: NodeJS.Signals | null; killed: boolean }>;
}

const READY_TIMEOUT_MS = 60_000;
const STOP_TIMEOUT_MS = 30_000;
const OUTPUT_LIMIT = 64 * 1024;

/** A port nobody listens on right now (the server is told not to try others). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.unref();
    s.on("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const address = s.address();
      const port = typeof address === "object" && address ? address.port : 0;
      s.close(() => (port ? resolve(port) : reject(new Error("no port"))));
    });
  });
}

function waitForExit(child: ChildProcess, ms: number): Promise<boolean> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve(true);
  return new Promise((resolve) => {
    const timer = setTimeout(() => {
      child.off("exit", onExit);
      resolve(false);
    }, ms);
    const onExit = (): void => {
      clearTimeout(timer);
      resolve(true);
    };
    child.once("exit", onExit);
  });
}

/** How to start one Jupyter server: the program and its arguments for a port and a token. */
export interface ServerCommand {
  readonly program: string;
  readonly args: (port: number, token: string) => string[];
  readonly env: NodeJS.ProcessEnv;
  readonly cwd: string;
}

/** Debian's classic notebook server serving `notebookDir`. */
function classicNotebook(jupyter: JupyterEnv, notebookDir: string): ServerCommand {
  return {
    program: SYSTEM_PYTHON,
    args: (port, token) => [
      "-m",
      "notebook",
      "--no-browser",
      "--allow-root",
      "--ip=127.0.0.1",
      `--port=${port}`,
      "--port-retries=0",
      `--NotebookApp.token=${token}`,
      "--NotebookApp.password=",
      `--notebook-dir=${notebookDir}`,
    ],
    env: jupyter.env,
    cwd: notebookDir,
  };
}

async function startOnce(command: ServerCommand): Promise<NotebookServer> {
  const port = await freePort();
  const token = randomBytes(24).toString("hex");
  const child = spawn(command.program, command.args(port, token), { env: command.env, cwd: command.cwd, stdio: ["ignore", "pipe", "pipe"] });
  let out = "";
  const keep = (chunk: Buffer): void => {
    out = (out + chunk.toString()).slice(-OUTPUT_LIMIT);
  };
  child.stdout!.on("data", keep);
  child.stderr!.on("data", keep);
  let exitInfo: { code: number | null; signal: NodeJS.Signals | null } | undefined;
  child.on("exit", (code, signal) => (exitInfo = { code, signal }));
  const spawned = await new Promise<boolean>((resolve) => {
    child.once("spawn", () => resolve(true));
    child.once("error", (e) => {
      keep(Buffer.from(String(e)));
      resolve(false);
    });
  });
  if (!spawned || child.pid === undefined) throw new Error(`could not start ${command.program}: ${out}`);
  const pid = child.pid;
  let stopping: ReturnType<NotebookServer["stop"]> | undefined;
  const server: NotebookServer = {
    pid,
    port,
    token,
    origin: `http://127.0.0.1:${port}`,
    output: () => out,
    exited: () => exitInfo !== undefined,
    stop: () =>
      (stopping ??= (async () => {
        let killed = false;
        if (!exitInfo) {
          process.kill(pid, "SIGTERM");
          if (!(await waitForExit(child, STOP_TIMEOUT_MS))) {
            killed = true;
            process.kill(pid, "SIGKILL");
            await waitForExit(child, 10_000);
          }
        }
        return { code: exitInfo?.code ?? null, signal: exitInfo?.signal ?? null, killed };
      })()),
  };
  // Ready when the API answers with the token.
  const deadline = Date.now() + READY_TIMEOUT_MS;
  while (!exitInfo) {
    try {
      const r = await fetch(`${server.origin}/api/status?token=${token}`, { signal: AbortSignal.timeout(5000) });
      if (r.ok) {
        await r.json();
        return server;
      }
    } catch {
      // Not listening yet.
    }
    if (Date.now() > deadline) {
      await server.stop();
      throw new Error(`the Jupyter server did not answer within ${READY_TIMEOUT_MS / 1000} s:\n${out.slice(-4000)}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw Object.assign(new Error(`the Jupyter server exited (${exitInfo.code ?? exitInfo.signal}) before answering:\n${out.slice(-4000)}`), { output: out });
}

/** Starts a Jupyter server on a free port (another, if someone took the port in between). */
export async function startJupyterServer(command: ServerCommand): Promise<NotebookServer> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await startOnce(command);
    } catch (e) {
      const output = (e as { output?: string }).output ?? "";
      if (attempt >= 3 || !/already in use|Address in use|EADDRINUSE/i.test(output)) throw e;
    }
  }
}

/** Starts Debian's classic notebook server on a free port. */
export function startNotebookServer(jupyter: JupyterEnv, notebookDir: string): Promise<NotebookServer> {
  return startJupyterServer(classicNotebook(jupyter, notebookDir));
}

/**
 * PIDs of processes whose command line mentions `text` (Linux /proc). Kernels started by the
 * server get a connection file in the private JUPYTER_RUNTIME_DIR, so that directory names them.
 */
export function processesMentioning(text: string): number[] {
  const found: number[] = [];
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry) || Number(entry) === process.pid) continue;
    try {
      const cmdline = readFileSync(`/proc/${entry}/cmdline`, "utf8").split("\0").join(" ");
      if (cmdline.includes(text)) found.push(Number(entry));
    } catch {
      // The process ended while we looked.
    }
  }
  return found;
}
