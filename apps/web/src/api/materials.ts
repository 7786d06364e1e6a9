import { http, seg } from './http';
import type { Id, ItemList, MaterialSummary } from './types';

export async function listMaterials(projectId: Id): Promise<MaterialSummary[]> {
  return (await http.get<ItemList<MaterialSummary>>(`/api/projects/${seg(projectId)}/materials`)).items;
}

export interface MaterialVersion {
  id: string;
  materialId?: string;
  version: number;
  status: string;
  params: Record<string, unknown>;
  notes?: string;
  createdAt?: string;
}

export interface MaterialDetail {
  id: string;
  projectId: string;
  name: string;
  description: string;
  latest: MaterialVersion | null;
  versions: MaterialVersion[];
}

export function getMaterial(id: Id): Promise<MaterialDetail> {
  return http.get<MaterialDetail>(`/api/materials/${seg(id)}`);
}
