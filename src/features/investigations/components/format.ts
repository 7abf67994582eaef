import { formatExactLength, formatSignedLength } from "../../../../shared/investigations/format";
import type { LengthUnit } from "../../../../shared/common/units";

/** Instants as the shop reads them: local date and time. */
export const when = (iso: string | null | undefined) =>
  iso ? new Date(iso).toLocaleString(undefined, { year: "numeric", month: "short", day: "numeric", hour: "2-digit", minute: "2-digit" }) : "—";

export const length = (v: number | null | undefined, unit: LengthUnit | null | undefined) => (v == null ? "—" : unit ? `${formatExactLength(v, unit)} ${unit}` : String(v));
export const signedLength = (v: number | null | undefined, unit: LengthUnit | null | undefined) => (v == null ? "—" : unit ? `${formatSignedLength(v, unit)} ${unit}` : String(v));
