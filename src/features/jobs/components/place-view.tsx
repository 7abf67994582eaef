import { clearanceText, lengthText, type PlaceView } from "../../../../shared/inspection/judging";
import type { LeafStack } from "../../../../shared/inspection/feeler";
import { DEFAULT_DECIMALS, type LengthUnit } from "../../../../shared/common/units";
import { cx } from "../../../components/ui/cx";

// How a judged place reads on the sheet: every reading with its own mark, both fits, form, 20 °C, leaves. The judging
// itself is shared code (shared/inspection/judging.ts); these components only show its answer.

/** A raw value as typed: never rounded, but padded to the unit's customary decimals (1.125 shows as 1.1250). */
export function rawValue(v: number, unit: LengthUnit): string {
  const text = String(v);
  const decimals = text.includes(".") ? text.split(".")[1].length : 0;
  return decimals >= DEFAULT_DECIMALS[unit] || /e/i.test(text) ? text : v.toFixed(DEFAULT_DECIMALS[unit]);
}

function Mark({ ok, label }: { ok: boolean; label: string }) {
  return (
    <span aria-label={label} title={label} className={cx("font-bold", ok ? "text-go" : "text-stop")}>
      {ok ? "✓" : "✕"}
    </span>
  );
}

const by = (b: { side: "min" | "max"; by: number; serviceable: boolean } | null, unit: LengthUnit) =>
  b ? `${lengthText(b.by, unit)} ${b.side === "max" ? "over" : "under"} the ${b.serviceable ? "serviceable " : ""}${b.side === "max" ? "maximum" : "minimum"}` : "";

/** A leaf or stack with its calibrated thickness: "0.0015 + 0.003 stack (0.0046)". */
export function stackText(s: LeafStack | null, unit: LengthUnit): string {
  return s ? `${s.leaves.map((l) => l.label).join(" + ")}${s.leaves.length > 1 ? " stack" : ""}, ${lengthText(s.thickness, unit)} thick` : "—";
}

/** The working of a judged place, in the table's unit. */
export function PlaceDetail({ place, unit }: { place: PlaceView; unit: LengthUnit }) {
  switch (place.kind) {
    case "size":
      return (
        <div className="flex flex-col gap-1 text-sm">
          <ul className="flex flex-wrap gap-x-4 gap-y-1" aria-label="Every reading">
            {place.directions.map((d) => (
              <li key={d.direction} className="tabular-nums">
                <Mark ok={d.verdict === "within_limits"} label={d.verdict === "within_limits" ? "within limits" : "outside limits"} /> direction {d.direction}:{" "}
                <span className="font-semibold">
                  {rawValue(d.raw, d.rawUnit)} {d.rawUnit}
                </span>
                {place.thermal && <span className="text-ink-soft"> → {lengthText(d.value, unit)} at 20 °C</span>}
                {d.beyond && <span className="font-semibold text-stop"> — {by(d.beyond, unit)}</span>}
              </li>
            ))}
          </ul>
          <p className="tabular-nums">
            {place.thermal && (
              <>
                at 20 °C: size <strong>{lengthText(place.size, unit)} {unit}</strong> (as read {lengthText(place.rawSize, unit)}) ·{" "}
              </>
            )}
            out-of-round {lengthText(place.outOfRound, unit)}
            {place.outOfRoundLimit != null && (
              <>
                {" "}
                (max {lengthText(place.outOfRoundLimit, unit)}) <Mark ok={place.outOfRoundVerdict === "within_limits"} label={place.outOfRoundVerdict === "within_limits" ? "out-of-round within its limit" : "out-of-round over its limit"} />
                {place.outOfRoundBeyond != null && <span className="font-semibold text-stop"> {lengthText(place.outOfRoundBeyond, unit)} over</span>}
              </>
            )}
          </p>
          {place.thermal && <p className="text-xs text-ink-soft">{place.thermal.text}</p>}
        </div>
      );
    case "fit": {
      const word = place.basis === "radial" ? " radial" : "";
      const side = (name: string, s: typeof place.loosest, against: string) => (
        <li className="tabular-nums">
          <Mark ok={s.verdict === "within_limits"} label={s.verdict === "within_limits" ? "within limits" : "outside limits"} /> {name}{" "}
          <strong>
            {clearanceText(s.value, unit)}
            {word}
          </strong>{" "}
          <span className="text-ink-soft">
            ({lengthText(s.boreValue, unit)} − {lengthText(s.journalValue, unit)}
            {place.basis === "radial" ? ` = ${lengthText(s.diametral, unit)} diametral, halved` : ""}; against the {against})
          </span>
          {s.beyond && <span className="font-semibold text-stop"> — {by(s.beyond, unit)}</span>}
        </li>
      );
      return (
        <ul className="flex flex-col gap-0.5 text-sm" aria-label="Both fits">
          {side("loosest", place.loosest, "maximum")}
          {side("tightest", place.tightest, "minimum")}
        </ul>
      );
    }
    case "taper":
      return (
        <div className="text-sm">
          <p className="tabular-nums">
            taper <strong>{lengthText(place.taper, unit)}</strong>
            {place.limit != null && ` (max ${lengthText(place.limit, unit)})`}
          </p>
          <ul className="flex flex-wrap gap-x-4 text-ink-soft" aria-label="Taper by direction">
            {place.directions.map((d) => (
              <li key={d.direction} className="tabular-nums">
                direction {d.direction}: {lengthText(d.a, unit)} − {lengthText(d.b, unit)} = {lengthText(d.difference, unit)}
              </li>
            ))}
          </ul>
        </div>
      );
    case "feeler":
      return (
        <div className="flex flex-col gap-0.5 text-sm">
          {place.mode === "go_no_go" ? (
            <p>
              go <strong>{stackText(place.go, unit)}</strong> {place.goEntered ? "entered" : "did not enter"} · no-go <strong>{stackText(place.noGo, unit)}</strong> {place.noGoEntered ? "entered" : "did not enter"}
            </p>
          ) : (
            <p>
              measured gap: thickest to enter <strong>{stackText(place.gap, unit)}</strong>
            </p>
          )}
          {(place.gapLow != null || place.gapHigh != null) && (
            <p className="tabular-nums text-ink-soft">
              the gap is {place.gapLow != null ? `at least ${lengthText(place.gapLow, unit)}` : ""}
              {place.gapLow != null && place.gapHigh != null ? " and " : ""}
              {place.gapHigh != null ? `under ${lengthText(place.gapHigh, unit)}` : ""}
            </p>
          )}
          {place.why && (
            <details className="text-xs text-ink-soft">
              <summary className="cursor-pointer">Why these leaves</summary>
              {place.why}
            </details>
          )}
        </div>
      );
    default:
      return null;
  }
}
