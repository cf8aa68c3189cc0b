import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    // A hang guard only: a test that nears it gets a smaller grid, not a longer limit.
    testTimeout: 60_000,
    // Three files at a time on two cores: the browser, Slurm and CLI tests spend much of their time
    // waiting (about 75 s against 94 s for the whole npm test with two, on a quiet machine).
    maxWorkers: 3,
  },
});
