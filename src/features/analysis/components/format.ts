/** A rate as a percentage to one decimal, or a dash when there is none. */
export const pct = (r: number | null | undefined) => (r == null ? "—" : `${(r * 100).toFixed(1)} %`);

/** An instant as the shop floor reads it: date and time in the browser's zone. */
export { formatDateTime as when } from "../../../lib/format";

/** A calendar date, YYYY-MM-DD. */
export { formatDate as day } from "../../../lib/format";
