import { afterEach, beforeEach, vi } from "vitest";

// An unexpected console error fails the test that caused it.
let errors: unknown[][] = [];
beforeEach(() => {
  errors = [];
  vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    errors.push(args);
  });
});
afterEach(() => {
  vi.restoreAllMocks();
  if (errors.length) throw new Error(`console.error was called: ${errors.map((e) => e.map(String).join(" ")).join("\n")}`);
});
