import { http, seg } from './http';
import type { Id, ItemList, TestDataSummary } from './types';

export async function listTestData(projectId: Id): Promise<TestDataSummary[]> {
  return (await http.get<ItemList<TestDataSummary>>(`/api/projects/${seg(projectId)}/test-data`)).items;
}
