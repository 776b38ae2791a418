import { ListQuery } from '../../core/http/api-error';
import { Role, User } from '../../core/auth/auth.models';

export type { Role };

/** A row of `GET /api/users`. */
export interface UserRow extends User {
  disabled: boolean;
  createdAt: string;
}

export type AccountSort = 'email' | 'displayName' | 'createdAt';

export interface AccountQuery extends ListQuery {
  sort?: AccountSort;
}

export interface CreateAccountBody {
  email: string;
  displayName: string;
  callSign?: string;
  roles: Role[];
  password: string;
}

export interface UpdateAccountBody {
  displayName?: string;
  callSign?: string | null;
  roles?: Role[];
  disabled?: boolean;
}
