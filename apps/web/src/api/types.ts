/**
 * Shapes of the API's answers, as the contract between apps/api and apps/web states them.
 * Kept in one file so that switching to the zod schemas of packages/shared touches one place.
 */

import type { RunDto } from '@phaseloop/shared';

export const PROJECT_ROLES = ['admin', 'analyst', 'reviewer', 'viewer'] as const;
export type ProjectRole = (typeof PROJECT_ROLES)[number];

/** Database keys: integers or UUIDs, depending on the table; compare them with sameId(). */
export type Id = string | number;

export function sameId(a: Id | null | undefined, b: Id | null | undefined): boolean {
  return a !== null && a !== undefined && b !== null && b !== undefined && String(a) === String(b);
}

/** ISO 8601 date-time string as the API sends it. */
export type IsoDateTime = string;

export interface User {
  id: Id;
  email: string;
  name: string;
  isAdmin: boolean;
  disabled?: boolean;
  createdAt?: IsoDateTime;
  lastLoginAt?: IsoDateTime | null;
}

export interface Membership {
  projectId: Id;
  projectName: string;
  role: ProjectRole;
}

export interface Me {
  user: User;
  memberships: Membership[];
}

export interface Project {
  id: Id;
  name: string;
  description: string;
  /** The caller's role in the project; null for a site admin who is not a member. */
  role: ProjectRole | null;
  memberCount: number;
  isDemo: boolean;
}

export interface ProjectMember {
  userId: Id;
  name: string;
  email: string;
  role: ProjectRole;
}

export const MATERIAL_STATUSES = ['draft', 'approved'] as const;
export type MaterialStatus = (typeof MATERIAL_STATUSES)[number] | (string & {});

export interface MaterialSummary {
  id: Id;
  name: string;
  version: number;
  status: MaterialStatus;
  model: string;
  isDemo: boolean;
  updatedAt: IsoDateTime;
}

export interface StudySummary {
  id: Id;
  name: string;
  template: string;
  description: string;
  isDemo: boolean;
  updatedAt: IsoDateTime;
  /** Name of the author, or a nested user, depending on the API version. */
  createdBy: string | { id?: Id; name: string } | null;
}

export const RUN_STATES = ['draft', 'queued', 'running', 'succeeded', 'failed', 'cancelled'] as const;
export type RunState = (typeof RUN_STATES)[number];

export interface RunSummary {
  id: Id;
  studyId: Id;
  studyName: string;
  /** Sequence number within the project, as people refer to runs ("run 12"). */
  number?: number;
  state: RunState;
  queuedAt: IsoDateTime | null;
  startedAt: IsoDateTime | null;
  finishedAt: IsoDateTime | null;
}

export interface TestDataSummary {
  id: Id;
  name: string;
  kind: string;
  filename: string;
  /** Test temperature in °C (tensile curves); null when it does not apply. */
  temperature?: number | null;
  /** File size in bytes. */
  size?: number;
  isDemo: boolean;
  createdAt: IsoDateTime;
}

export interface AdminUser {
  id: Id;
  email: string;
  name: string;
  isAdmin: boolean;
  disabled: boolean;
  createdAt: IsoDateTime;
  lastLoginAt: IsoDateTime | null;
  memberships: Membership[];
  /** Quotas checked when a run is queued: runs queued or running at once, and model size in nodes. */
  maxActiveRuns: number;
  maxNodes: number;
}

export interface Invitation {
  id: Id;
  email: string;
  projectId: Id;
  projectName: string;
  role: ProjectRole;
  expiresAt: IsoDateTime;
  acceptedAt: IsoDateTime | null;
}

export interface InvitationPreview {
  email: string;
  projectName: string;
  role: ProjectRole;
  expiresAt: IsoDateTime;
}

export interface CapturedMail {
  id: Id;
  from: string;
  to: string | string[];
  subject: string;
  text: string;
  receivedAt: IsoDateTime;
}

export interface AuditEntry {
  id: Id;
  /** Who acted: a name/e-mail string or a small user object, depending on the API version. */
  actor: string | { id?: Id; name?: string; email?: string } | null;
  action: string;
  target: string | null;
  details: unknown;
  createdAt: IsoDateTime;
}

export interface HealthStatus {
  status: 'ok' | 'degraded';
  database: { ok: boolean };
  queue: { ok: boolean };
  worker: { ready: boolean; lastSeen: IsoDateTime | null };
}

export interface ItemList<T> {
  items: T[];
}

/** A run with its progress, as GET /api/runs/:id answers (snapshot only on that route). */
export type RunDetail = RunDto;
