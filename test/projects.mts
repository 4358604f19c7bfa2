/**
 * Which test files run in which vitest project. vitest.config.mts builds its projects from
 * this module and test/projects.test.ts checks that every test file lands in exactly one, so
 * the split and its check cannot drift apart.
 *
 * - "unit" (`npm run test:unit`): suites that run in-process from the TypeScript sources,
 *   with no build, no Debian packages, no browser, Jupyter or kernel process.
 * - "integration" (`npm run test:integration`): suites that drive outside programs or the
 *   built package: they need `npm run build` and scripts/ensure-system-deps.sh.
 *
 * Patterns are paths from the repository root with `*` (within a name) and `**` (any folders)
 * only; a test file in a folder not listed here matches no project, and the check says so.
 */

/** Integration files, each with the reason it cannot run in the unit loop. */
export const INTEGRATION_FILES: Readonly<Record<string, string>> = {
  "test/browser/**/*.test.ts": "Chromium on built pages, exports and Jupyter servers (classic notebook; JupyterLab 4, Notebook 7 with the lab extension)",
  "test/cli/binary.test.ts": "spawns the built binary dist/src/cli/main.js",
  "test/cli/render.test.ts": "spawns the built binary dist/src/cli/main.js",
  "test/hardening/hostile-page.test.ts": "headless Chromium",
  "test/kernel/kernel-conformance.test.ts": "Debian's jupyter_kernel_test against the built kernel",
  "test/kernel/kernel-install.test.ts": "installs the built kernel with Debian's jupyter_client",
  "test/kernel/launch.test.ts": "spawns the built kernel launcher",
  "test/kernel/kernel-hostile.test.ts": "Debian's jupyter_client as a hostile front-end of the built kernel",
  "test/kernel/kernel-load.test.ts": "Debian's jupyter_client loading the built kernel (bursts, long loops, kill -9 and restart)",
  "test/kernel/widget-protocol.test.ts": "Debian's jupyter_client as a widget front-end of the built kernel",
  "test/kernel/design-stop.test.ts": "Debian's jupyter_client stops a design run in the built kernel (Stop button, interrupt)",
  "test/live/notebooks-live.test.ts": "Debian's nbconvert with the quietframe kernel",
  "test/notebooks/notebooks.test.ts": "Debian's nbconvert with the tslab kernel",
  "test/sweep/slurm.test.ts": "starts Debian's Slurm and munge daemons (as root) and runs the built CLI in array jobs",
  "test/timedomain/browser-bits.test.ts": "headless Chromium",
  "test/widgets/methods/latex-compile.test.ts": "Debian's TeX Live (pdflatex, bibtex, siunitx) compiles the LaTeX methods exports",
};

/** Folders whose test files are unit suites, apart from the integration files above. */
const UNIT_FOLDERS = [
  "cli",
  "design",
  "engine",
  "hardening",
  "kernel",
  "layout",
  "linalg",
  "live",
  "notebooks",
  "numeric",
  "reach",
  "reference",
  "setup",
  "sweep",
  "timedomain",
  "tolerance",
  "units",
  "widgets",
];

export interface ProjectFiles {
  readonly include: readonly string[];
  readonly exclude: readonly string[];
}

export const UNIT_TESTS: ProjectFiles = {
  include: ["test/*.test.ts", ...UNIT_FOLDERS.map((folder) => `test/${folder}/**/*.test.ts`)],
  exclude: Object.keys(INTEGRATION_FILES),
};

export const INTEGRATION_TESTS: ProjectFiles = {
  include: Object.keys(INTEGRATION_FILES),
  exclude: [],
};

/**
 * Global set-up of the unit project: makes the two files that in-process code loads from
 * dist/ (the browser runtime bundle and the tolerance-map worker) without a build.
 */
export const UNIT_GLOBAL_SETUP = "test/helpers/unit-artifacts.ts";
