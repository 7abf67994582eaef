import { cx } from "./cx";

/** One filter in force on a list, in words ("Status: Awaiting signature"). */
export interface ActiveFilter {
  key: string;
  label: string;
}

/**
 * The filters a list is showing, each as a chip with a clear button, and how many records match —
 * so a person who arrived from a count on the overview sees what was counted and can widen the list.
 * Renders nothing when no filter is in force.
 */
export function FilterChips({ filters, onClear, onClearAll, total, noun, className }: { filters: ActiveFilter[]; onClear: (key: string) => void; onClearAll?: () => void; total?: number; noun?: [singular: string, plural: string]; className?: string }) {
  if (filters.length === 0) return null;
  return (
    <div role="group" aria-label="Active filters" className={cx("no-print flex flex-wrap items-center gap-2 text-sm", className)}>
      <span className="text-ink-soft">Showing only</span>
      {filters.map((f) => (
        <span key={f.key} className="inline-flex items-center gap-1 rounded-full border border-brass/50 bg-brass-light py-0.5 pl-3 pr-1 font-semibold text-ink">
          {f.label}
          <button
            type="button"
            onClick={() => onClear(f.key)}
            aria-label={`Clear filter ${f.label}`}
            title="Clear this filter"
            className="inline-flex h-7 w-7 items-center justify-center rounded-full text-ink-soft hover:bg-brass/20 hover:text-ink"
          >
            <span aria-hidden="true">✕</span>
          </button>
        </span>
      ))}
      {onClearAll && filters.length > 1 && (
        <button type="button" onClick={onClearAll} className="underline">
          Clear all
        </button>
      )}
      {total != null && noun && (
        <span aria-live="polite" data-testid="filtered-total" className="text-ink-soft">
          · {total} {total === 1 ? noun[0] : noun[1]}
        </span>
      )}
    </div>
  );
}

/** The chips for the filters of a list that hold a value, described by `describe` (a filter it leaves out gets no chip). */
export function activeFilters<F extends string>(filters: Record<F, string>, describe: Partial<Record<F, (value: string) => string>>): ActiveFilter[] {
  return (Object.keys(describe) as F[]).filter((k) => filters[k]).map((k) => ({ key: k, label: describe[k]!(filters[k]) }));
}
