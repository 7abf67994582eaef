import seedrandom from "seedrandom";

/**
 * The randomized run order of a crossed study: for each appraiser and each trial, every part once in its own
 * shuffled order (AIAG MSA 4th ed.: parts measured in random order so that appraisers cannot recall earlier
 * readings). The same seed always gives the same order, so an order can be re-derived to check the stored one.
 * Result: order[appraiser][trial] = part numbers (1-based) in the order they are measured.
 */
export function runOrder(seed: string, parts: number, appraisers: number, trials: number): number[][][] {
  const rng = seedrandom(seed);
  return Array.from({ length: appraisers }, () =>
    Array.from({ length: trials }, () => {
      const order = Array.from({ length: parts }, (_, i) => i + 1);
      // Fisher–Yates with the seeded generator.
      for (let i = order.length - 1; i > 0; i--) {
        const k = Math.floor(rng() * (i + 1));
        [order[i], order[k]] = [order[k], order[i]];
      }
      return order;
    }),
  );
}

export interface RunPrompt {
  /** 1-based place in this appraiser's sequence. */
  position: number;
  trial: number;
  part: number;
}

/** One appraiser's prompts in order: trial 1's shuffled parts, then trial 2's, and so on. */
export function promptsFor(order: number[][][], appraiserIndex: number): RunPrompt[] {
  const out: RunPrompt[] = [];
  order[appraiserIndex].forEach((parts, t) => parts.forEach((part) => out.push({ position: out.length + 1, trial: t + 1, part })));
  return out;
}
