import type { RunLogLine } from '@phaseloop/shared';
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

/** One stored line of a run's log (GET /api/runs/:id/logs), ordered by `seq`. */
export type RunLogRecord = RunLogLine;

/** Largest page the API answers; a shorter page means the stored log has been read to its end. */
export const RUN_LOG_PAGE = 5000;

export function listRunLogs(id: Id, afterSeq = -1): Promise<RunLogRecord[]> {
  return http.get<RunLogRecord[]>(`/api/runs/${seg(id)}/logs?afterSeq=${afterSeq}&limit=${RUN_LOG_PAGE}`);
}

export type { RunReviewStatus } from '@phaseloop/shared';
export type RunReviewDecision = 'approve' | 'reject';

/** The review fields every run answer carries. */
export type RunReviewFields = Pick<RunDetail, 'reviewStatus' | 'reviewReason'>;

/** Analysts and admins ask for a review of a run that succeeded. */
export function requestRunReview(id: Id): Promise<RunDetail & RunReviewFields> {
  return http.post<RunDetail & RunReviewFields>(`/api/runs/${seg(id)}/request-review`);
}

/** Reviewers and admins approve or reject; a rejection needs a reason. */
export function reviewRun(id: Id, decision: RunReviewDecision, reason: string): Promise<RunDetail & RunReviewFields> {
  return http.post<RunDetail & RunReviewFields>(`/api/runs/${seg(id)}/review`, { decision, reason });
}

export interface RunComment {
  id: Id;
  authorId: Id | null;
  authorName: string | null;
  body: string;
  createdAt: string;
}

export function listRunComments(id: Id): Promise<RunComment[]> {
  return http.get<RunComment[]>(`/api/comments?targetType=run&targetId=${encodeURIComponent(id)}`);
}

export function addRunComment(id: Id, body: string): Promise<RunComment> {
  return http.post<RunComment>('/api/comments', { targetType: 'run', targetId: id, body });
}
