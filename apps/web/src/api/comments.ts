/** Comments on a material version, a study or a run (one thread per target). */
import type { Id } from './types';
import { http } from './http';

export type CommentTargetType = 'material-version' | 'study' | 'run';

export interface TargetComment {
  id: Id;
  authorId: Id | null;
  authorName: string | null;
  body: string;
  createdAt: string;
}

export function listComments(targetType: CommentTargetType, targetId: Id): Promise<TargetComment[]> {
  const query = new URLSearchParams({ targetType, targetId: String(targetId) });
  return http.get<TargetComment[]>(`/api/comments?${query.toString()}`);
}

export function addComment(targetType: CommentTargetType, targetId: Id, body: string): Promise<TargetComment> {
  return http.post<TargetComment>('/api/comments', { targetType, targetId, body });
}
