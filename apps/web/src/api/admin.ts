import { http, seg } from './http';
import type { AdminUser, AuditEntry, CapturedMail, Id, Invitation, ItemList, ProjectRole } from './types';

export async function listUsers(): Promise<AdminUser[]> {
  return (await http.get<ItemList<AdminUser>>('/api/admin/users')).items;
}

export function updateUser(id: Id, input: { isAdmin?: boolean; disabled?: boolean; name?: string; maxActiveRuns?: number; maxNodes?: number }): Promise<unknown> {
  return http.patch<unknown>(`/api/admin/users/${seg(id)}`, input);
}

export async function listInvitations(): Promise<Invitation[]> {
  return (await http.get<ItemList<Invitation>>('/api/admin/invitations')).items;
}

export function createInvitation(input: { email: string; projectId: Id; role: ProjectRole }): Promise<unknown> {
  return http.post<unknown>('/api/admin/invitations', input);
}

export function revokeInvitation(id: Id): Promise<void> {
  return http.delete(`/api/admin/invitations/${seg(id)}`);
}

export async function listMail(): Promise<CapturedMail[]> {
  return (await http.get<ItemList<CapturedMail>>('/api/admin/mail')).items;
}

export async function listAudit(): Promise<AuditEntry[]> {
  return (await http.get<ItemList<AuditEntry>>('/api/admin/audit')).items;
}
