import path from "node:path";
import { defineConfig } from "vitest/config";

// "server-only" guards against bundling into the browser; in tests it is an empty module.
const alias = { "@": path.resolve(__dirname), "server-only": path.resolve(__dirname, "scripts/empty-module.mjs") };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: { name: "unit", include: ["tests/unit/**/*.test.ts", "tests/unit/**/*.test.tsx"], environment: "node", sequence: { groupOrder: 0 } },
      },
      {
        resolve: { alias },
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          // The suites that share the running app go one after the other, never side by side.
          sequence: { groupOrder: 1 },
          environment: "node",
          globalSetup: ["tests/helpers/global-setup.ts"],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          sequence: { groupOrder: 2 },
          environment: "node",
          globalSetup: ["tests/helpers/global-setup.ts"],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 120_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "faults",
          include: ["tests/faults/**/*.test.ts"],
          environment: "node",
          globalSetup: ["tests/helpers/global-setup.ts"],
          fileParallelism: false,
          // Last: these stop and restart the database under everyone's feet.
          sequence: { groupOrder: 3 },
          testTimeout: 180_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});
