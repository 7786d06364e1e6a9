/** Material library: materials of a project, their versions, new drafts and reviews. */
import type { MaterialParams } from '@phaseloop/shared';
import { http, seg } from './http';
import type { Id, IsoDateTime, ItemList, MaterialSummary } from './types';

export type MaterialVersionStatus = 'draft' | 'approved' | 'rejected';

/** A row of the project's material list: the material and its latest version. */
export interface MaterialListItem extends MaterialSummary {
  status: MaterialVersionStatus;
  latestVersionId: string | null;
  /** The latest version's reviewer once reviewed, else its author. */
  updatedByName: string | null;
}

export async function listMaterials(projectId: Id): Promise<MaterialListItem[]> {
  return (await http.get<ItemList<MaterialListItem>>(`/api/projects/${seg(projectId)}/materials`)).items;
}

export interface MaterialVersion {
  id: string;
  materialId: string;
  version: number;
  status: MaterialVersionStatus;
  params: MaterialParams;
  provenance: Record<string, unknown>;
  notes: string;
  createdAt: IsoDateTime;
  createdBy: string | null;
  createdByName: string | null;
  reviewedBy: string | null;
  reviewedByName: string | null;
  reviewedAt: IsoDateTime | null;
  reviewReason: string;
}

export interface MaterialDetail {
  id: string;
  projectId: string;
  name: string;
  description: string;
  latest: MaterialVersion | null;
  /** Newest first. */
  versions: MaterialVersion[];
}

export function getMaterial(id: Id): Promise<MaterialDetail> {
  return http.get<MaterialDetail>(`/api/materials/${seg(id)}`);
}

export function getMaterialVersion(id: Id): Promise<MaterialVersion> {
  return http.get<MaterialVersion>(`/api/material-versions/${seg(id)}`);
}

export interface NewDraftInput {
  params: MaterialParams;
  notes: string;
  provenance?: Record<string, unknown>;
}

/** Saves a new draft version after the latest one (analysts and admins). */
export function createDraftVersion(materialId: Id, input: NewDraftInput): Promise<MaterialVersion> {
  return http.post<MaterialVersion>(`/api/materials/${seg(materialId)}/versions`, input);
}

export type ReviewDecision = 'approve' | 'reject';

/** Approves or rejects a draft (reviewers and admins; a rejection needs a reason). */
export function reviewMaterialVersion(versionId: Id, decision: ReviewDecision, reason = ''): Promise<MaterialVersion> {
  return http.post<MaterialVersion>(`/api/material-versions/${seg(versionId)}/review`, { decision, reason });
}

export interface NewMaterialInput extends NewDraftInput {
  name: string;
  description: string;
}

/** Creates a material with its version 1 as a draft (analysts and admins). */
export function createMaterial(projectId: Id, input: NewMaterialInput): Promise<MaterialDetail> {
  return http.post<MaterialDetail>(`/api/projects/${seg(projectId)}/materials`, input);
}
