import { describe, expect, it } from "vitest";
import { promptsFor, runOrder } from "./run-order";

// Randomized run order (AIAG MSA 4th ed.: every appraiser measures every part in random order, trial by trial).
describe("randomized run order of a study", () => {
  it("every appraiser measures every part once per trial", () => {
    const order = runOrder("study-seed-1", 10, 3, 3);
    expect(order).toHaveLength(3);
    for (const appraiser of order) {
      expect(appraiser).toHaveLength(3);
      for (const trial of appraiser) expect([...trial].sort((a, b) => a - b)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    }
  });

  it("the same seed gives the same order, so a stored order can be re-derived and checked", () => {
    expect(runOrder("seed-A", 8, 2, 2)).toEqual(runOrder("seed-A", 8, 2, 2));
    expect(runOrder("seed-A", 8, 2, 2)).not.toEqual(runOrder("seed-B", 8, 2, 2));
  });

  it("orders differ between trials and appraisers (not the same list repeated)", () => {
    const order = runOrder("seed-C", 10, 3, 3);
    const lists = order.flat().map((t) => t.join(","));
    expect(new Set(lists).size).toBe(lists.length);
  });

  it("an appraiser's prompts run through trial 1, then trial 2, numbered from 1", () => {
    const order = runOrder("seed-D", 5, 2, 2);
    const prompts = promptsFor(order, 1);
    expect(prompts).toHaveLength(10);
    expect(prompts.slice(0, 5).every((p) => p.trial === 1)).toBe(true);
    expect(prompts.slice(5).every((p) => p.trial === 2)).toBe(true);
    expect(prompts.map((p) => p.position)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(prompts.slice(0, 5).map((p) => p.part)).toEqual(order[1][0]);
  });
});
