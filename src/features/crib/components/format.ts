/** An instant as the crib reads it: date and 24-hour time in the shop's zone. */
export { formatDateTime as shortWhen } from "../../../lib/format";
