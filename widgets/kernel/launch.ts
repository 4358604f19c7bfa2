#!/usr/bin/env node
/** The entry Jupyter starts for the quietframe kernel. */
import { writeSync } from "node:fs";
import { createConverter } from "tslab/dist/converter";
import { createExecutor, type ConverterSet } from "tslab/dist/executor";
import { installKernelComms } from "../core/comm/kernel-comms";
import { CommKernelServer, QuietframeHandler } from "./kernel-server";
import { registerWidgetTargets } from "../core/comm/widget-targets";

/**
 * The quietframe kernel: tslab's TypeScript executor and message handling, served by
 * CommKernelServer (comms + widget protocol). Jupyter starts it from the kernel spec as
 * `node launch.js --config-path {connection_file}`; the working directory is the notebook's.
 */

/** The kernel log: the process's own stderr. tslab redirects process.stderr.write into cell outputs. */
export function kernelLog(line: string): void {
  try {
    writeSync(2, `[quietframe kernel] ${line}\n`);
  } catch {
    // stderr closed: nowhere left to report.
  }
}

/** tslab compiles cells for Node (and, on request, for a browser); each converter starts a TypeScript service, so lazily. */
function converters(): ConverterSet {
  let node: ReturnType<typeof createConverter> | undefined;
  let browser: ReturnType<typeof createConverter> | undefined;
  return {
    get node() {
      return (node ??= createConverter({ isJS: false, isBrowser: false }));
    },
    get browser() {
      return (browser ??= createConverter({ isJS: false, isBrowser: true }));
    },
    close() {
      node?.close();
      browser?.close();
    },
  };
}

export function parseLaunchArgs(argv: readonly string[]): { configPath: string } {
  const i = argv.indexOf("--config-path");
  const configPath = i >= 0 ? argv[i + 1] : argv.find((a) => a.startsWith("--config-path="))?.slice("--config-path=".length);
  if (!configPath) throw new Error("usage: quietframe kernel: --config-path <connection file> is required (Jupyter passes it)");
  return { configPath };
}

/**
 * Ends the kernel once the process that started it is gone. jupyter_client names itself in
 * JPY_PARENT_PID; without this a kernel whose Jupyter was killed keeps running, unseen.
 */
export function watchParent(pid: number, intervalMs = 1000): NodeJS.Timeout {
  const timer = setInterval(() => {
    try {
      process.kill(pid, 0);
    } catch (e) {
      // EPERM: it exists but belongs to someone else, so it is alive.
      if ((e as NodeJS.ErrnoException).code === "ESRCH") {
        kernelLog(`parent process ${pid} is gone; shutting down`);
        process.exit(0);
      }
    }
  }, intervalMs);
  timer.unref();
  return timer;
}

export async function startKernel(configPath: string): Promise<CommKernelServer> {
  const convs = converters();
  void convs.node; // warm the compiler before the first cell arrives
  const executor = createExecutor(process.cwd(), convs, { log: console.log, error: console.error });
  const server = new CommKernelServer(new QuietframeHandler(executor, false), configPath, kernelLog);
  installKernelComms(server.comms);
  registerWidgetTargets(server.comms);
  process.on("SIGINT", () => executor.interrupt());
  // A callback's failure (e.g. in a widget listener) must not end the session.
  process.on("uncaughtException", (err) => kernelLog(`uncaught exception: ${err.stack ?? String(err)}`));
  process.on("unhandledRejection", (reason) => kernelLog(`unhandled rejection: ${reason instanceof Error ? (reason.stack ?? reason.message) : String(reason)}`));
  await server.init();
  const parent = Number(process.env.JPY_PARENT_PID);
  if (Number.isInteger(parent) && parent > 1) watchParent(parent);
  kernelLog(`started (pid ${process.pid})`);
  return server;
}

if (require.main === module) {
  try {
    const { configPath } = parseLaunchArgs(process.argv.slice(2));
    startKernel(configPath).catch((e: unknown) => {
      kernelLog(`failed to start: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      process.exit(1);
    });
  } catch (e) {
    kernelLog(e instanceof Error ? e.message : String(e));
    process.exit(2);
  }
}
