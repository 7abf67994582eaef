import Decimal from "decimal.js";

export { Decimal };

/** A length or other exact quantity as it arrives: a JSON number, a decimal string, or a Decimal. */
export type DecimalLike = number | string | Decimal;

/** Exact decimal of a value; a JS number is taken at its shortest round-trip form, so 1.1250 is exactly 1.125. */
export function dec(x: DecimalLike): Decimal {
  if (Decimal.isDecimal(x)) return x as Decimal;
  if (typeof x === "number") {
    if (!Number.isFinite(x)) throw new RangeError(`Not a finite length: ${x}`);
    // String(n) is the shortest text that reads back as n: the value the person typed, not its binary neighbour.
    return new Decimal(String(x));
  }
  const text = x.trim();
  if (text === "") throw new RangeError("Empty text is not a number");
  return new Decimal(text);
}

/** A Decimal back to a JS number for JSON; the nearest double to the exact value. */
export function num(d: Decimal): number {
  return d.toNumber();
}

/** Decimal or null, for optional limits. */
export function decOrNull(x: DecimalLike | null | undefined): Decimal | null {
  return x === null || x === undefined ? null : dec(x);
}
