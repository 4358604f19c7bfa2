/**
 * Global set-up of the unit test project. Two files that in-process code reads from dist/
 * are made here, so that the unit suites need no `npm run build`:
 * - dist/widgets/runtime.js, the browser runtime HTML outputs inline, by the build's own
 *   scripts/build-runtime.js;
 * - dist/src/tolerance/worker.js, the tolerance-map worker thread, bundled from its sources
 *   (worker threads cannot load TypeScript).
 * Each is remade only when missing or older than the newest source, so a fresh build is kept
 * and a stale one is never tested. Together they take well under a second.
 */
import { execFileSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { buildSync } from "esbuild";

const ROOT = join(__dirname, "..", "..");
const RUNTIME = join(ROOT, "dist", "widgets", "runtime.js");
const WORKER = join(ROOT, "dist", "src", "tolerance", "worker.js");
const SOURCES = [join(ROOT, "src"), join(ROOT, "widgets"), join(ROOT, "scripts", "build-runtime.js")];

function newestModification(path: string): number {
  const stat = statSync(path);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of readdirSync(path)) newest = Math.max(newest, newestModification(join(path, entry)));
  return newest;
}

function isFresh(file: string, sourcesChanged: number): boolean {
  return existsSync(file) && statSync(file).mtimeMs >= sourcesChanged;
}

export default function setup(): void {
  const sourcesChanged = Math.max(...SOURCES.map(newestModification));
  if (!isFresh(RUNTIME, sourcesChanged)) {
    execFileSync(process.execPath, [join(ROOT, "scripts", "build-runtime.js")], { cwd: ROOT, stdio: "inherit" });
  }
  if (!isFresh(WORKER, sourcesChanged)) {
    buildSync({
      entryPoints: [join(ROOT, "src", "tolerance", "worker.ts")],
      outfile: WORKER,
      bundle: true,
      packages: "external",
      platform: "node",
      format: "cjs",
      target: "node20",
      tsconfig: join(ROOT, "tsconfig.json"),
      logLevel: "warning",
    });
  }
}
