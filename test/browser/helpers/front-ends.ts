import { execFileSync } from "node:child_process";
import { copyFileSync, mkdirSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { delimiter, dirname, join } from "node:path";
import { createPrivateJupyterDirs, REPO_ROOT } from "../../jupyter/env";
import { run } from "../../jupyter/notebook-file";
import { startJupyterServer, type NotebookServer } from "./notebook-server";

/**
 * JupyterLab 4 and Notebook 7 as users run them: the virtual environment of
 * scripts/ensure-python-env.sh (pinned jupyterlab, notebook, ipywidgets from PyPI), private
 * Jupyter and JupyterLab directories, the quietframe kernel and the lab extension installed
 * there by our own CLI, and one Jupyter server that serves both front-ends.
 */
const CLI = join(REPO_ROOT, "dist", "src", "cli", "main.js");

/** The pinned environment (created on first use; reused while its pins match). */
export function pythonEnvDir(): string {
  return execFileSync("bash", [join(REPO_ROOT, "scripts", "ensure-python-env.sh"), "--print-dir"], { encoding: "utf8", stdio: ["ignore", "pipe", "inherit"] }).trim();
}

export interface FrontEndEnv {
  readonly dir: string;
  /** Where the kernel spec and the extension are installed (PREFIX/share/jupyter). */
  readonly prefix: string;
  /** The environment's bin/ first on PATH, so `jupyter` is the pinned one, as after activating it. */
  readonly env: NodeJS.ProcessEnv;
  readonly python: string;
  /** Runs the built quietframe CLI in this environment; throws with its stderr when it fails. */
  cli(args: string[]): Promise<string>;
  dispose(): void;
}

/** JupyterLab settings for the tests: widget state saved with the notebook, every cell attached to the page. */
const SETTINGS: Record<string, Record<string, unknown>> = {
  "@jupyter-widgets/jupyterlab-manager/plugin.jupyterlab-settings": { saveState: true },
  "@jupyterlab/notebook-extension/tracker.jupyterlab-settings": { windowingMode: "none" },
  "@jupyterlab/apputils-extension/notification.jupyterlab-settings": { fetchNews: "false", checkForUpdates: false },
};

export function createFrontEndEnv(): FrontEndEnv {
  const venv = pythonEnvDir();
  const { dir, prefix, env } = createPrivateJupyterDirs("quietframe-front-ends-");
  const settings = join(dir, "lab-settings");
  for (const [file, value] of Object.entries(SETTINGS)) {
    mkdirSync(dirname(join(settings, file)), { recursive: true });
    writeFileSync(join(settings, file), JSON.stringify(value));
  }
  const full: NodeJS.ProcessEnv = {
    ...env,
    PATH: [join(venv, "bin"), env.PATH ?? ""].join(delimiter),
    VIRTUAL_ENV: venv,
    JUPYTERLAB_SETTINGS_DIR: settings,
    JUPYTERLAB_WORKSPACES_DIR: join(dir, "lab-workspaces"),
  };
  return {
    dir,
    prefix,
    env: full,
    python: join(venv, "bin", "python"),
    cli: async (args) => {
      const r = await run(process.execPath, [CLI, ...args], { env: full, timeoutMs: 60_000 });
      if (r.code !== 0) throw new Error(`quietframe ${args.join(" ")} failed: ${r.stderr}`);
      return r.stdout;
    },
    dispose: () => rmSync(dir, { recursive: true, force: true }),
  };
}

/**
 * A notebook folder for the server: copies of example notebooks in notebooks/, beside links to
 * the built dist/ and examples/, so their relative imports ("../dist/...") work unchanged.
 */
export function notebookRoot(dir: string, notebooks: Record<string, string>): string {
  const root = join(dir, "root");
  mkdirSync(join(root, "notebooks"), { recursive: true });
  for (const name of ["dist", "examples"]) symlinkSync(join(REPO_ROOT, name), join(root, name), "dir");
  for (const [copy, original] of Object.entries(notebooks)) copyFileSync(join(REPO_ROOT, "notebooks", original), join(root, "notebooks", copy));
  return root;
}

/** The pinned `jupyter lab` on 127.0.0.1 with a token; it serves Notebook 7's pages too. The app object is exposed for the tests. */
export function startLab(fe: FrontEndEnv, root: string): Promise<NotebookServer> {
  return startJupyterServer({
    program: join(dirname(fe.python), "jupyter"),
    args: (port, token) => [
      "lab",
      "--no-browser",
      "--allow-root",
      "--ip=127.0.0.1",
      `--port=${port}`,
      "--port-retries=0",
      `--IdentityProvider.token=${token}`,
      "--ServerApp.password=",
      `--ServerApp.root_dir=${root}`,
      "--LabApp.expose_app_in_browser=True",
      "--JupyterNotebookApp.expose_app_in_browser=True",
    ],
    env: fe.env,
    cwd: root,
  });
}
