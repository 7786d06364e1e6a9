/**
 * Uploaded meshes. The upload is multipart, which the JSON client does not send, so it fetches the
 * session's CSRF token and posts the form itself; answers are read the same way as every other call.
 */
import type { MeshDetail, MeshSummary } from '@phaseloop/shared';
import { ApiError, http, seg, toApiError } from './http';
import type { Id, ItemList } from './types';

export type { MeshDetail, MeshSummary };

export async function listMeshes(projectId: Id): Promise<MeshSummary[]> {
  return (await http.get<ItemList<MeshSummary>>(`/api/projects/${seg(projectId)}/meshes`)).items;
}

export function getMesh(id: Id): Promise<MeshDetail> {
  return http.get<MeshDetail>(`/api/meshes/${seg(id)}`);
}

async function postForm(path: string, form: FormData): Promise<Response> {
  const { token } = await http.get<{ token: string }>('/api/auth/csrf');
  try {
    return await fetch(path, { method: 'POST', body: form, credentials: 'same-origin', headers: { accept: 'application/json', 'x-csrf-token': token } });
  } catch {
    throw new ApiError(0, 'network', 'The server could not be reached. Check your connection.');
  }
}

/** Uploads a .msh file; a file the API cannot read comes back as an ApiError naming the line. */
export async function uploadMesh(projectId: Id, file: File, name?: string): Promise<MeshSummary> {
  const form = new FormData();
  if (name) form.append('name', name);
  form.append('file', file, file.name);
  const response = await postForm(`/api/projects/${seg(projectId)}/meshes`, form);
  const text = await response.text();
  let body: unknown = undefined;
  try { body = text === '' ? undefined : JSON.parse(text); } catch { body = text; }
  if (!response.ok) throw toApiError(response.status, body);
  return body as MeshSummary;
}
