export const ROLES = ['member', 'technician', 'treasurer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  member: 'Member',
  technician: 'Technician',
  treasurer: 'Treasurer',
  admin: 'Admin',
};

/** The signed-in person, as `GET /api/auth/session` returns it. */
export interface User {
  id: number | string;
  email: string;
  displayName: string;
  callSign: string | null;
  roles: Role[];
}

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
