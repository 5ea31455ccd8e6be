/** What every paged list endpoint answers: one page and the cursor of the next (null on the last page). */
export interface ListPage<T> {
  items: T[];
  nextCursor: string | null;
}
