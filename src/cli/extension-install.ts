/**
 * `quietframe extension install | remove`: puts the prebuilt JupyterLab extension
 * "quietframe-live" (JupyterLab 4 and Notebook 7 draw quietframe's live chart with it) into a
 * Jupyter data directory, share/jupyter/labextensions/quietframe-live/, or takes it out again.
 * No rebuild of JupyterLab: it loads prebuilt extensions from every Jupyter data directory.
 */
import { cpSync, existsSync, mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { QuietframeError } from "../errors";
import { findJupyterPython } from "./jupyter-python";
import { parseOptions } from "./options";
import type { CliIo } from "./io";

export const EXTENSION_NAME = "quietframe-live";

export const EXTENSION_USAGE = `  quietframe extension install [--sys-prefix | --user | --prefix DIR] [--python PATH]
  quietframe extension remove  [--sys-prefix | --user | --prefix DIR] [--python PATH]
      Installs (or removes) the JupyterLab 4 / Notebook 7 extension "${EXTENSION_NAME}" that draws
      the live chart. --sys-prefix (default): the environment Jupyter runs in; --user: your
      own Jupyter data directory; --prefix DIR: DIR/share/jupyter. --python as for kernel install.
      Reload the JupyterLab page afterwards.
`;

/** The built extension: beside the compiled CLI (dist/labextension/), or dist/ of a clone when run from the sources. */
export function builtExtensionDir(): string {
  const candidates = [resolve(__dirname, "..", "..", "labextension", EXTENSION_NAME), resolve(__dirname, "..", "..", "dist", "labextension", EXTENSION_NAME)];
  const found = candidates.find((d) => existsSync(join(d, "package.json")));
  if (!found) {
    throw new QuietframeError({
      path: "extension",
      value: candidates[0],
      problem: "is not built",
      allowed: "a quietframe package, which ships it, or `npm run build:labextension` in a clone of the repository",
    });
  }
  return found;
}

interface Where {
  sysPrefix?: boolean;
  user?: boolean;
  prefix?: string;
  python?: string;
}

/** The labextensions directory the options name (Jupyter's Python answers for --user and --sys-prefix). */
export function labextensionsDir(where: Where, env: NodeJS.ProcessEnv = process.env): string {
  const chosen = (["sysPrefix", "user", "prefix"] as const).filter((k) => where[k] !== undefined && where[k] !== false);
  if (chosen.length > 1) {
    throw new QuietframeError({
      path: "extension",
      value: chosen.map((k) => (k === "sysPrefix" ? "--sys-prefix" : `--${k}`)).join(" "),
      problem: "names more than one place",
      allowed: "one of --sys-prefix, --user or --prefix DIR",
    });
  }
  if (where.prefix !== undefined) return join(resolve(where.prefix), "share", "jupyter", "labextensions");
  const python = findJupyterPython({ python: where.python, env });
  return where.user ? join(python.userDataDir, "labextensions") : join(python.prefix, "share", "jupyter", "labextensions");
}

function writable(path: string, action: () => void): void {
  try {
    action();
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code ?? String(e);
    throw new QuietframeError({ path: "extension", value: path, problem: `cannot be written (${code})`, allowed: "a directory you may write: --user, or --prefix DIR" });
  }
}

export function extensionCommand(args: string[], io: CliIo): number {
  const [sub, ...rest] = args;
  if (sub !== "install" && sub !== "remove") {
    throw new QuietframeError({ path: "extension", value: sub ?? "", problem: "is not an extension subcommand", allowed: "install, remove", choices: ["install", "remove"] });
  }
  const { values } = parseOptions(`extension ${sub}`, rest, { "sys-prefix": { type: "boolean" }, user: { type: "boolean" }, prefix: { type: "string" }, python: { type: "string" } }, false);
  const where = { sysPrefix: values["sys-prefix"], user: values.user, prefix: values.prefix, python: values.python };
  const source = sub === "install" ? builtExtensionDir() : undefined;
  const target = join(labextensionsDir(where), EXTENSION_NAME);
  if (source === undefined) {
    if (!existsSync(target)) {
      io.out(`The ${EXTENSION_NAME} extension is not in ${target}: nothing to remove\n`);
      return 0;
    }
    writable(target, () => rmSync(target, { recursive: true, force: true }));
    io.out(`Removed the ${EXTENSION_NAME} extension from ${target}; reload JupyterLab's page\n`);
    return 0;
  }
  writable(target, () => {
    rmSync(target, { recursive: true, force: true });
    mkdirSync(target, { recursive: true });
    cpSync(source, target, { recursive: true });
    // JupyterLab shows this beside the extension in `jupyter labextension list`.
    const again = where.prefix !== undefined ? ` --prefix ${JSON.stringify(resolve(where.prefix))}` : where.user ? " --user" : "";
    const install = { packageManager: "npm", packageName: "quietframe", uninstallInstructions: `npx quietframe extension remove${again}` };
    writeFileSync(join(target, "install.json"), `${JSON.stringify(install, null, 2)}\n`);
  });
  io.out(`Installed the ${EXTENSION_NAME} extension in ${target}; reload JupyterLab's page\n`);
  return 0;
}
