// The API's data shapes shared with the client (imported there as `@contracts/accounts`).
// Plain TypeScript: types and `as const` lists only, no framework or node imports.

/** Roles a person may hold (several at once); in this order wherever roles are listed. */
export const ROLES = ['member', 'technician', 'treasurer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** The `user` of `GET /api/auth/session`, `POST /api/auth/sign-in` and `POST /api/auth/register`. */
export interface User {
  id: number;
  email: string;
  displayName: string;
  callSign: string | null;
  roles: Role[];
}

/** A row of `GET /api/users`; also the answer of `POST /api/users` and `PATCH /api/users/:id`. */
export interface UserRow extends User {
  disabled: boolean;
  createdAt: string;
}
