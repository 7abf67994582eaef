/** The source of "now" for services and jobs; tests pass a fixed or movable one. */
export interface Clock {
  now(): Date;
}

export const systemClock: Clock = { now: () => new Date() };

/** A clock tests can set and move. */
export function fixedClock(start: Date | string) {
  let current = new Date(start);
  return {
    now: () => new Date(current),
    set(to: Date | string) {
      current = new Date(to);
    },
    advanceDays(days: number) {
      current = new Date(current.getTime() + days * 86_400_000);
    },
  };
}
