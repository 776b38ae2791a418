// The API's data shapes shared with the client (imported there as `@contracts/lists`).
// Plain TypeScript: types and `as const` lists only, no framework or node imports.

/** A page of any list route (`GET /api/tickets`, `GET /api/users`). */
export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}
