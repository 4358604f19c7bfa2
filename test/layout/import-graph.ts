import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";

/**
 * The project's own import graph, read from the sources as text: every `import … from`,
 * `export … from`, `import("…")` and `require("…")` with a relative specifier, resolved to a
 * file the way TypeScript resolves it (x.ts, x.d.ts, x/index.ts). Package imports are kept
 * by name so rules can refuse them (node: modules in browser code).
 */
export const ROOT = resolve(__dirname, "..", "..");

export interface ImportEdge {
  /** Importing file, relative to the project root with forward slashes. */
  readonly from: string;
  /** The specifier as written. */
  readonly specifier: string;
  /** Resolved file relative to the root, or undefined for a package import. */
  readonly to: string | undefined;
  /** 1-based line of the import. */
  readonly line: number;
}

const SPECIFIER = /(?:\bfrom\s*|\bimport\s*\(\s*|\brequire\s*\(\s*|^\s*import\s+)(["'])([^"'\n]+)\1/gm;

export function sourceFiles(...folders: string[]): string[] {
  const out: string[] = [];
  const walk = (dir: string): void => {
    for (const name of readdirSync(dir)) {
      const path = join(dir, name);
      if (statSync(path).isDirectory()) walk(path);
      else if (name.endsWith(".ts")) out.push(toRootPath(path));
    }
  };
  for (const f of folders) walk(join(ROOT, f));
  return out.sort();
}

function toRootPath(absolute: string): string {
  return relative(ROOT, absolute).split("\\").join("/");
}

function resolveRelative(fromFile: string, specifier: string): string | undefined {
  const base = resolve(ROOT, dirname(fromFile), specifier.replace(/\.js$/, ""));
  for (const candidate of [`${base}.ts`, `${base}.d.ts`, join(base, "index.ts"), base]) {
    if (existsSync(candidate) && statSync(candidate).isFile()) return toRootPath(candidate);
  }
  return undefined;
}

/** Removes comments (keeping line breaks) so that an import named in a comment is not read. */
function withoutComments(text: string): string {
  return text.replace(/\/\*[\s\S]*?\*\//g, (m) => m.replace(/[^\n]/g, " ")).replace(/(^|[^:"'`\\])\/\/[^\n]*/g, "$1");
}

export function importsOf(file: string): ImportEdge[] {
  const text = withoutComments(readFileSync(join(ROOT, file), "utf8"));
  const edges: ImportEdge[] = [];
  for (const m of text.matchAll(SPECIFIER)) {
    const specifier = m[2];
    const line = text.slice(0, m.index).split("\n").length;
    if (specifier.startsWith(".")) {
      const to = resolveRelative(file, specifier);
      if (to === undefined) throw new Error(`${file}:${line}: cannot resolve ${specifier}`);
      edges.push({ from: file, specifier, to, line });
    } else {
      edges.push({ from: file, specifier, to: undefined, line });
    }
  }
  return edges;
}

/** Strongly connected components of a directed graph with more than one node (Tarjan). */
export function cycles(nodes: readonly string[], next: (node: string) => readonly string[]): string[][] {
  let counter = 0;
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const found: string[][] = [];
  const visit = (v: string): void => {
    index.set(v, counter);
    low.set(v, counter++);
    stack.push(v);
    onStack.add(v);
    for (const w of next(v)) {
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) {
        low.set(v, Math.min(low.get(v)!, index.get(w)!));
      }
    }
    if (low.get(v) === index.get(v)) {
      const component: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        component.push(w);
      } while (w !== v);
      if (component.length > 1) found.push(component.sort());
    }
  };
  for (const v of nodes) if (!index.has(v)) visit(v);
  return found;
}
