import { build } from "esbuild";
import { readFileSync, writeFileSync } from "node:fs";
import { extname, join } from "node:path";
import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { REPO_ROOT } from "../../jupyter/env";

/**
 * Builds the widget-manager test page (page/page.ts) into `dir` and serves it, with the built
 * quietframe-live module, under <harness origin>/quietframe-harness/.
 */
export const HARNESS_PATH = "/quietframe-harness/";
export const LIVE_MODULE_FILE = join(REPO_ROOT, "dist", "live-frontend", "amd", "index.js");

const TYPES: Record<string, string> = { ".html": "text/html", ".js": "text/javascript", ".css": "text/css" };

export async function buildHarness(dir: string): Promise<void> {
  await build({
    entryPoints: [join(__dirname, "page", "page.ts")],
    outdir: dir,
    entryNames: "page",
    bundle: true,
    format: "iife",
    target: "es2020",
    platform: "browser",
    loader: { ".woff": "dataurl", ".woff2": "dataurl", ".ttf": "dataurl", ".eot": "dataurl", ".svg": "dataurl", ".png": "dataurl", ".gif": "dataurl" },
    define: { "process.env.NODE_ENV": '"production"' },
    tsconfig: join(__dirname, "page", "tsconfig.json"),
    logLevel: "error",
  });
  writeFileSync(
    join(dir, "index.html"),
    `<!doctype html><html><head><meta charset="utf-8"><title>widget manager</title><link rel="stylesheet" href="page.css"></head>` +
      `<body><div id="outputs" style="width:900px"></div><script src="page.js"></script></body></html>`,
  );
}

export interface HarnessServer {
  /** http://127.0.0.1:<port> */
  readonly origin: string;
  close(): Promise<void>;
}

/**
 * Serves the harness files and the live module on 127.0.0.1 (a page of its own origin, as a
 * JupyterLab or notebook page is: the browser's local-network checks refuse websockets to
 * the loopback server from a page without an address). The Jupyter server allows the origin.
 */
export async function startHarnessServer(dir: string): Promise<HarnessServer> {
  const server = createServer((req, res) => {
    const name = new URL(req.url ?? "/", "http://127.0.0.1").pathname.slice(HARNESS_PATH.length);
    const file = name === "quietframe-live.js" ? LIVE_MODULE_FILE : /^(index\.html|page\.js|page\.css)$/.test(name) ? join(dir, name) : undefined;
    if (name === "" || req.url === "/favicon.ico") {
      res.writeHead(204).end();
      return;
    }
    if (!file) {
      res.writeHead(404).end("not found");
      return;
    }
    res.writeHead(200, { "content-type": TYPES[extname(file)] ?? "application/octet-stream" }).end(readFileSync(file));
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => resolve());
  });
  const address = server.address() as AddressInfo;
  return {
    origin: `http://127.0.0.1:${address.port}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** Lets pages of `origin` use the Jupyter server's REST and websocket API (NotebookApp.allow_origin). */
export function allowOrigin(jupyterConfigDir: string, origin: string): void {
  writeFileSync(join(jupyterConfigDir, "jupyter_notebook_config.json"), JSON.stringify({ NotebookApp: { allow_origin: origin } }));
}
