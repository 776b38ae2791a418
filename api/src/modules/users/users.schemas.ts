// Request bodies and queries of the admin accounts routes. Strict objects: no mass assignment.
import { z } from 'zod';
import { ROLES } from '../../contracts/accounts';
import { idSchema, queryInt } from '../../schemas';
import { callSign, displayName, email, passwordInput } from '../auth/auth.schemas';

const roles = z
  .array(z.enum(ROLES, { error: `Roles are ${ROLES.join(', ')}.` }))
  .max(ROLES.length)
  .transform((r) => [...new Set(r)]);

export const createUserBody = z.strictObject({
  email,
  displayName,
  callSign: callSign.nullable().optional(),
  roles: roles.refine((r) => r.length > 0, 'Give the person at least one role.'),
  password: passwordInput,
});

export const patchUserBody = z
  .strictObject({
    displayName: displayName.optional(),
    callSign: callSign.nullable().optional(),
    roles: roles.refine((r) => r.length > 0, 'Give the person at least one role.').optional(),
    disabled: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Nothing to change.');

export const USER_SORTS = ['email', 'displayName', 'createdAt'] as const;

export const listUsersQuery = z.strictObject({
  page: queryInt(1, 100_000, 1),
  pageSize: queryInt(1, 100, 25),
  sort: z.enum(USER_SORTS).default('displayName'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  q: z.string().trim().max(100).optional(),
});

export const userIdParam = z.strictObject({ id: idSchema });

export type CreateUserBody = z.infer<typeof createUserBody>;
export type PatchUserBody = z.infer<typeof patchUserBody>;
export type ListUsersQuery = z.infer<typeof listUsersQuery>;
