import { http, seg } from './http';
import type { Id, ItemList, Project, ProjectMember, ProjectRole } from './types';

export async function listProjects(): Promise<Project[]> {
  return (await http.get<ItemList<Project>>('/api/projects')).items;
}

export function getProject(id: Id): Promise<Project> {
  return http.get<Project>(`/api/projects/${seg(id)}`);
}

export function createProject(input: { name: string; description: string }): Promise<Project> {
  return http.post<Project>('/api/projects', input);
}

export function updateProject(id: Id, input: { name?: string; description?: string }): Promise<Project> {
  return http.patch<Project>(`/api/projects/${seg(id)}`, input);
}

export async function listMembers(projectId: Id): Promise<ProjectMember[]> {
  return (await http.get<ItemList<ProjectMember>>(`/api/projects/${seg(projectId)}/members`)).items;
}

export function setMemberRole(projectId: Id, userId: Id, role: ProjectRole): Promise<unknown> {
  return http.put<unknown>(`/api/projects/${seg(projectId)}/members/${seg(userId)}`, { role });
}

export function removeMember(projectId: Id, userId: Id): Promise<void> {
  return http.delete(`/api/projects/${seg(projectId)}/members/${seg(userId)}`);
}
