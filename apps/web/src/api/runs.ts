import { http, seg } from './http';
import type { Id, ItemList, RunSummary } from './types';

export async function listRuns(projectId: Id): Promise<RunSummary[]> {
  return (await http.get<ItemList<RunSummary>>(`/api/projects/${seg(projectId)}/runs`)).items;
}
