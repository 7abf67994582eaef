/// <reference types="vitest/config" />
import { defineConfig } from "vite";
import react from "@vitejs/plugin-react";
import tailwindcss from "@tailwindcss/vite";
import { fileURLToPath } from "node:url";

const sharedDir = fileURLToPath(new URL("./shared", import.meta.url));

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: { alias: { "@shared": sharedDir } },
  // No source maps in the build: the served client is the minified code only.
  build: { outDir: "dist/client", sourcemap: false },
  server: {
    port: 5173,
    proxy: { "/api": "http://127.0.0.1:3000", "/t/": "http://127.0.0.1:3000" },
  },
  test: {
    // One closing summary for the whole suite; test files for each layer live
    // next to their code (shared/) or under tests/.
    projects: [
      {
        resolve: { alias: { "@shared": sharedDir } },
        test: { name: "unit", include: ["shared/**/*.test.ts", "tests/unit/**/*.test.ts"], environment: "node" },
      },
      {
        resolve: { alias: { "@shared": sharedDir } },
        test: {
          name: "api",
          include: ["tests/api/**/*.test.ts"],
          environment: "node",
          setupFiles: ["tests/support/fail-on-console-error.ts"],
          testTimeout: 30000,
          hookTimeout: 60000,
          pool: "forks",
        },
      },
      {
        // Real processes and clusters stopped, killed and restarted: one file at a time.
        resolve: { alias: { "@shared": sharedDir } },
        test: {
          name: "faults",
          include: ["tests/faults/**/*.test.ts"],
          environment: "node",
          setupFiles: ["tests/support/fail-on-console-error.ts"],
          testTimeout: 120000,
          hookTimeout: 180000,
          pool: "forks",
          fileParallelism: false,
        },
      },
      {
        resolve: { alias: { "@shared": sharedDir } },
        test: {
          name: "browser",
          include: ["tests/e2e/**/*.test.ts"],
          environment: "node",
          testTimeout: 60000,
          hookTimeout: 120000,
          pool: "forks",
          fileParallelism: false,
        },
      },
    ],
  },
});
