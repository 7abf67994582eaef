import type { QueryClient, QueryKey } from "@tanstack/react-query";

/**
 * Keyset paging behind a numbered pager: the cursor a page is read on from, which is the nextCursor of the page before
 * it when that page is in the query cache (the user came to it by "Next"). The list is then asked by ?after=, a range
 * of an index at the same cost however far in; a page opened by its number alone (a link, a reload) is asked by its
 * number. The page's query key leaves the cursor out: it names the same rows either way.
 */
export function cursorFromPageBefore<P extends { page: number }>(client: QueryClient, keyOf: (p: P) => QueryKey, p: P): string | undefined {
  if (p.page <= 1) return undefined;
  return client.getQueryData<{ nextCursor?: string | null }>(keyOf({ ...p, page: p.page - 1 }))?.nextCursor ?? undefined;
}
