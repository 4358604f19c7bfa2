import { availableParallelism } from "node:os";
import { defineConfig } from "vitest/config";
import { INTEGRATION_TESTS, UNIT_GLOBAL_SETUP, UNIT_TESTS } from "./test/projects.mts";

// Two projects (see test/projects.ts): "unit" runs from the sources with no build and no
// outside programs; "integration" needs a build and the Debian packages. `vitest run` runs both.
export default defineConfig({
  test: {
    testTimeout: 60_000,
    // Set-up hooks render figures or start browsers and kernels; on a busy 2-core machine
    // they can take well over the 10 s default.
    hookTimeout: 120_000,
    projects: [
      {
        extends: true,
        test: {
          name: "unit",
          include: [...UNIT_TESTS.include],
          exclude: [...UNIT_TESTS.exclude],
          globalSetup: [UNIT_GLOBAL_SETUP],
          // Every core (vitest's default leaves one free): the main process only waits on these
          // CPU-bound files, and on 2 cores one worker would take nearly twice as long.
          maxWorkers: availableParallelism(),
          // Projects with different worker counts run as separate groups: the fast unit loop first.
          sequence: { groupOrder: 0 },
        },
      },
      {
        extends: true,
        test: { name: "integration", include: [...INTEGRATION_TESTS.include], exclude: [...INTEGRATION_TESTS.exclude], sequence: { groupOrder: 1 } },
      },
    ],
  },
});
