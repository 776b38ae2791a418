import { Role } from '@contracts/accounts';
import { ListQuery } from '../../core/http/api-error';

// The rows are the API's shape (api/src/contracts/accounts.ts); queries and bodies are the client's.
export type { Role };
export type { UserRow } from '@contracts/accounts';

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
