import { forgetCsrfToken, http, seg } from './http';
import type { InvitationPreview, User } from './types';

export function getInvitation(token: string): Promise<InvitationPreview> {
  return http.get<InvitationPreview>(`/api/invitations/${seg(token)}`);
}

export async function acceptInvitation(token: string, name: string, password: string): Promise<User> {
  const { user } = await http.post<{ user: User }>(`/api/invitations/${seg(token)}/accept`, { name, password });
  // Accepting signs the new user in, which starts a new session.
  forgetCsrfToken();
  return user;
}
