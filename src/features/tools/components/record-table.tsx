import type { ReactNode } from "react";
import { cx } from "../../../components/ui/cx";
import { ScrollBox } from "../../../components/ui/scroll-box";

/**
 * The compact table of a tool's records (checks, set elements, calibration points): scrolls sideways on a
 * phone, small-caps headings; `false` leaves a heading out (a column only some roles see).
 */
export function RecordTable({ label, headers, className, children }: { label: string; headers: (string | false)[]; className?: string; children: ReactNode }) {
  return (
    <ScrollBox label={label}>
      <table className={cx("w-full text-left text-sm", className)} aria-label={label}>
        <thead className="text-xs uppercase tracking-wide text-ink-faint">
          <tr>
            {headers.map((h, i) =>
              h === false ? null : (
                <th key={h} className={i === 0 ? "py-1 pr-3" : i === headers.length - 1 ? undefined : "pr-3"}>
                  {h}
                </th>
              ),
            )}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </ScrollBox>
  );
}
