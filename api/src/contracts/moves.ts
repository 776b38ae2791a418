// Shapes of the moves routes (undo, flags, assignment), shared with the client as `@contracts/moves`.
// Plain TypeScript: types only, no framework or node imports.

/** A row of `GET /api/technicians`: who can be given a ticket. */
export interface TechnicianOption {
  id: number;
  displayName: string;
  callSign: string | null;
}
