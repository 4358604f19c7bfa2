import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    testTimeout: 60_000,
    // Set-up hooks render figures or start browsers and kernels; on a busy 2-core machine
    // they can take well over the 10 s default.
    hookTimeout: 120_000,
  },
});
