import { http, seg } from './http';
import type { Id, ItemList, MaterialSummary } from './types';

export async function listMaterials(projectId: Id): Promise<MaterialSummary[]> {
  return (await http.get<ItemList<MaterialSummary>>(`/api/projects/${seg(projectId)}/materials`)).items;
}
