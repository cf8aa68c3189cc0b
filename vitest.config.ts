import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    // Hang guards, not speed checks: generous, so a loaded machine still passes.
    testTimeout: 120_000,
    hookTimeout: 120_000,
    // Three files at a time on two cores: the browser, scheduler and CLI tests spend much of
    // their time waiting (about 75 s against 94 s for the whole npm test with two on a quiet machine).
    maxWorkers: 3,
  },
});
