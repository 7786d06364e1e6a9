import { http, seg } from './http';
import type { Id, ItemList, RunDetail, RunSummary } from './types';

export async function listRuns(projectId: Id): Promise<RunSummary[]> {
  return (await http.get<ItemList<RunSummary>>(`/api/projects/${seg(projectId)}/runs`)).items;
}

export function getRun(id: Id): Promise<RunDetail> {
  return http.get<RunDetail>(`/api/runs/${seg(id)}`);
}

export function cancelRun(id: Id): Promise<RunDetail> {
  return http.post<RunDetail>(`/api/runs/${seg(id)}/cancel`);
}

/** Queues the same frozen snapshot again as a new run. */
export function rerunRun(id: Id): Promise<RunDetail> {
  return http.post<RunDetail>(`/api/runs/${seg(id)}/rerun`);
}

export interface IterationRecord {
  seq: number;
  segment: number;
  increment: number;
  iteration: number;
  time: number;
  residualNorm: number;
  correctionNorm: number;
  cutBacks: number;
}

export function listIterations(id: Id, afterSeq = -1): Promise<IterationRecord[]> {
  return http.get<IterationRecord[]>(`/api/runs/${seg(id)}/iterations?afterSeq=${afterSeq}&limit=10000`);
}

export interface FrameRecord {
  frame: number;
  segment: number;
  increment: number;
  time: number;
  history: Record<string, number>;
}

export function listFrames(id: Id): Promise<FrameRecord[]> {
  return http.get<FrameRecord[]>(`/api/runs/${seg(id)}/frames`);
}

export interface RunFile {
  id: string;
  name: string;
  contentType: string;
  size: number;
  complete: boolean;
  createdAt: string;
}

export function listRunFiles(id: Id): Promise<RunFile[]> {
  return http.get<RunFile[]>(`/api/runs/${seg(id)}/files`);
}

/** Same-origin download address of one stored result (result.json, frames.pvd, history.csv, frame-k.vtu). */
export function resultUrl(id: Id, name: string): string {
  return `/api/runs/${seg(id)}/results/${seg(name)}`;
}

export function fileUrl(id: Id, name: string): string {
  return `/api/runs/${seg(id)}/files/${seg(name)}`;
}
