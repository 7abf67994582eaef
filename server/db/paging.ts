/** Rows to skip before a page (pages count from 1). */
export const pageOffset = (page: number, pageSize: number) => (page - 1) * pageSize;

/**
 * One page of a list and the count of all its rows, asked together: `rows` is the paged select,
 * `counted` the matching `select({ total: count() })` (same joins and where).
 */
export async function listPage<T>(rows: PromiseLike<T[]>, counted: PromiseLike<{ total: number }[]>): Promise<{ items: T[]; total: number }> {
  const [items, [{ total }]] = await Promise.all([rows, counted]);
  return { items, total };
}
