import { describe, expect, it } from "vitest";
import { timeOrderedId } from "../../server/db/ids";

// The layout checked is RFC 9562 §5.7 (UUID version 7): 48 bits of Unix time in milliseconds, the version nibble 7,
// 12 bits, the variant bits 10, 62 bits. From memory of the RFC's field table; the `uuid` package implements it.
describe("keys of readings and their judgements (server/db/ids.ts)", () => {
  it("are version 7 UUIDs whose first 48 bits are the time they were made, in milliseconds", () => {
    const before = Date.now();
    const id = timeOrderedId();
    const after = Date.now();
    expect(id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-7[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    const ms = parseInt(id.slice(0, 8) + id.slice(9, 13), 16);
    expect(ms).toBeGreaterThanOrEqual(before);
    expect(ms).toBeLessThanOrEqual(after);
  });

  it("sort in the order they were made, so a reading's key goes in at one end of its index, and never repeat", () => {
    const ids = Array.from({ length: 5000 }, () => timeOrderedId());
    expect([...ids].sort()).toEqual(ids);
    expect(new Set(ids).size).toBe(ids.length);
  });
});
