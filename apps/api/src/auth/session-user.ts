import type { Role } from './permissions';

/** What a request knows about its signed-in user (kept small; loaded per request from the session). */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}
