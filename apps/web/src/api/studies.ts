import { http, seg } from './http';
import type { Id, ItemList, RunDetail, StudySummary } from './types';

export async function listStudies(projectId: Id): Promise<StudySummary[]> {
  return (await http.get<ItemList<StudySummary>>(`/api/projects/${seg(projectId)}/studies`)).items;
}

/** A study as stored: the editor's own keys (template, params) beside the fe-core model. */
export interface StudyDetail {
  id: string;
  projectId: string;
  name: string;
  description: string;
  definition: Record<string, unknown>;
  /** Sent back with every edit so that two people editing at once do not overwrite each other. */
  revision: number;
  createdAt: string;
  updatedAt: string;
}

export interface StudyInput {
  name: string;
  description: string;
  definition: Record<string, unknown>;
}

export function getStudy(id: Id): Promise<StudyDetail> {
  return http.get<StudyDetail>(`/api/studies/${seg(id)}`);
}

export function createStudy(projectId: Id, input: StudyInput): Promise<StudyDetail> {
  return http.post<StudyDetail>(`/api/projects/${seg(projectId)}/studies`, input);
}

export function updateStudy(id: Id, input: StudyInput & { revision: number }): Promise<StudyDetail> {
  return http.patch<StudyDetail>(`/api/studies/${seg(id)}`, input);
}

export function duplicateStudy(id: Id, name?: string): Promise<StudyDetail> {
  return http.post<StudyDetail>(`/api/studies/${seg(id)}/duplicate`, name ? { name } : {});
}

/** Freezes the study as it is stored now and queues a run of it. */
export function submitStudyRun(id: Id): Promise<RunDetail> {
  return http.post<RunDetail>(`/api/studies/${seg(id)}/runs`);
}

export function listStudyRuns(id: Id): Promise<RunDetail[]> {
  return http.get<RunDetail[]>(`/api/studies/${seg(id)}/runs`);
}
