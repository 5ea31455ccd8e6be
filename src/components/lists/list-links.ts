/** Links of a paged list, built from the page's own query so a view stays bookmarkable and shareable. */

export interface ListColumn {
  label: string;
  /** The `sort` key when the column can be sorted. */
  sort?: string;
  numeric?: boolean;
}

/** The same view with some parameters replaced (undefined removes one); always back to the first page unless a cursor is given. */
export function withParams(path: string, current: URLSearchParams, changes: Record<string, string | undefined>): string {
  const next = new URLSearchParams(current);
  next.delete("cursor");
  for (const [key, value] of Object.entries(changes)) {
    if (value === undefined || value === "") next.delete(key);
    else next.set(key, value);
  }
  const text = next.toString();
  return text ? `${path}?${text}` : path;
}

/** The link of a column heading: sorts by it, and a second click turns the direction. */
export function sortHref(path: string, current: URLSearchParams, column: string, active: { sort: string; dir: "asc" | "desc" }): string {
  const dir = active.sort === column ? (active.dir === "asc" ? "desc" : "asc") : "asc";
  return withParams(path, current, { sort: column, dir });
}

/** The export link: the list's API with the same search, filters and sort, as CSV. */
export function csvHref(apiPath: string, current: URLSearchParams): string {
  return withParams(apiPath, current, { format: "csv", limit: undefined });
}

/** Whether the view narrows the list (a search or a filter), so an empty page says "nothing matches" rather than "nothing yet". */
export function isFiltered(current: URLSearchParams): boolean {
  return [...current.entries()].some(
    ([key, value]) => !["sort", "dir", "cursor", "limit", "format"].includes(key) && value !== "" && value !== "all",
  );
}
