import type { Role } from '../../shared/api/users';

/** The signed-in person a request acts for; every service call is scoped by it. */
export interface Actor {
  userId: number;
  businessId: number;
  role: Role;
  /** A customer sign-in's own customer record; null for staff. */
  customerId: number | null;
  email: string;
  name: string;
  jti: string;
  expiresAt: Date;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      actor?: Actor;
      authVia?: 'cookie' | 'bearer';
    }
  }
}
