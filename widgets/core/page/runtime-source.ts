/** Node only: the browser runtime bundle's text, read from the build. */
import { existsSync, readFileSync } from "node:fs";
import { dirname, join } from "node:path";

/**
 * The browser runtime bundle (dist/widgets/runtime.js, built by scripts/build-runtime.js).
 * Found from the package root, so it works both from compiled code in dist/ and from the
 * TypeScript sources under test.
 */
export const RUNTIME_FILE = join("dist", "widgets", "runtime.js");

let cached: string | undefined;

export function runtimeSource(): string {
  if (cached !== undefined) return cached;
  const root = packageRoot(__dirname);
  const file = join(root, RUNTIME_FILE);
  if (!existsSync(file)) throw new Error(`quietframe: the browser runtime ${RUNTIME_FILE} is missing; run \`npm run build\``);
  const text = readFileSync(file, "utf8");
  // The bundle is inlined into <script>; the build checks this too, a stale file might not have been.
  if (/<\/script|<!--/i.test(text)) throw new Error(`quietframe: ${RUNTIME_FILE} contains text that would end an inline script`);
  cached = text;
  return text;
}

function packageRoot(start: string): string {
  for (let dir = start; ; dir = dirname(dir)) {
    const manifest = join(dir, "package.json");
    if (existsSync(manifest)) {
      try {
        if ((JSON.parse(readFileSync(manifest, "utf8")) as { name?: unknown }).name === "quietframe") return dir;
      } catch {
        // Not our manifest; keep looking upwards.
      }
    }
    if (dirname(dir) === dir) throw new Error("quietframe: cannot find the package root (package.json named quietframe)");
  }
}
