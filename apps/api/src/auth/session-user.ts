/** What a request knows about its signed-in user (re-read per request from the users table). */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
}
