import { ROLES, Role } from '@contracts/accounts';

// Roles and the signed-in person are the API's shapes (api/src/contracts/accounts.ts); bodies are the client's.
export { ROLES };
export type { Role };
export type { User } from '@contracts/accounts';

export const ROLE_LABELS: Record<Role, string> = {
  member: 'Member',
  technician: 'Technician',
  treasurer: 'Treasurer',
  admin: 'Admin',
};

export interface SignInBody {
  email: string;
  password: string;
}

export interface RegisterBody {
  email: string;
  password: string;
  displayName: string;
  callSign?: string;
}

export interface ChangePasswordBody {
  currentPassword: string;
  newPassword: string;
}

export interface ResetConfirmBody {
  token: string;
  newPassword: string;
}
