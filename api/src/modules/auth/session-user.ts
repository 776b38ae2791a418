// The signed-in person as every handler sees it (req.user), set by the session middleware.
import type { Role } from '../../contracts/accounts';

export interface SessionUser {
  id: number;
  email: string;
  displayName: string;
  callSign: string | null;
  roles: Role[];
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      user?: SessionUser;
    }
  }
}
