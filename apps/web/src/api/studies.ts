import { http, seg } from './http';
import type { Id, ItemList, StudySummary } from './types';

export async function listStudies(projectId: Id): Promise<StudySummary[]> {
  return (await http.get<ItemList<StudySummary>>(`/api/projects/${seg(projectId)}/studies`)).items;
}
