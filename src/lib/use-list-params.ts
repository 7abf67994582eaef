import { useCallback, useMemo } from "react";
import { useSearchParams } from "react-router-dom";
import type { SortingState } from "@tanstack/react-table";

/**
 * List state (page, sort, filters) kept in the URL, so a count on a dashboard
 * can link straight to the filtered list and a view can be shared.
 */
export function useListParams<F extends string>(filterKeys: readonly F[], defaults: { sort?: string; pageSize?: number } = {}) {
  const [sp, setSp] = useSearchParams();
  const page = Math.max(1, Number(sp.get("page") ?? 1) || 1);
  const pageSize = Number(sp.get("pageSize") ?? defaults.pageSize ?? 50) || 50;
  const sort = sp.get("sort") ?? defaults.sort ?? "";
  const filters = useMemo(() => Object.fromEntries(filterKeys.map((k) => [k, sp.get(k) ?? ""])) as Record<F, string>, [sp, filterKeys]);

  const update = useCallback(
    (patch: Record<string, string | number | null>) => {
      setSp(
        (prev) => {
          const next = new URLSearchParams(prev);
          for (const [k, v] of Object.entries(patch)) {
            if (v === null || v === "") next.delete(k);
            else next.set(k, String(v));
          }
          if (!("page" in patch)) next.delete("page");
          return next;
        },
        { replace: true },
      );
    },
    [setSp],
  );

  // "field" or "-field" ↔ TanStack sorting state.
  const sorting: SortingState = sort ? [{ id: sort.replace(/^-/, ""), desc: sort.startsWith("-") }] : [];
  const setSorting = (updater: SortingState | ((s: SortingState) => SortingState)) => {
    const next = typeof updater === "function" ? updater(sorting) : updater;
    update({ sort: next[0] ? `${next[0].desc ? "-" : ""}${next[0].id}` : null });
  };

  /** Clears the named filters (all of them when none is named), back to the first page. */
  const clearFilters = (...keys: F[]) => update(Object.fromEntries((keys.length ? keys : filterKeys).map((k) => [k, null])));

  return { page, pageSize, sort, filters, sorting, setSorting, setPage: (p: number) => update({ page: p }), setFilter: (k: F, v: string) => update({ [k]: v }), clearFilters, update };
}
