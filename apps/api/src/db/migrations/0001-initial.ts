/**
 * First schema. Plain SQL so that the schema reads the same in a migration, psql and a review.
 * Units follow the rest of Phaseloop (MPa, mm, s, °C); JSON columns hold validated documents
 * from @phaseloop/shared.
 */
import type { Migration } from '../migrate';

export const initialSchema: Migration = {
  name: '0001-initial',
  async up({ context: sql }) {
    await sql(`
CREATE TABLE users (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  email text NOT NULL UNIQUE CHECK (email = lower(email)),
  name text NOT NULL,
  password_hash text NOT NULL,
  -- Site admins manage users, invitations and the whole queue; roles live on memberships.
  is_admin boolean NOT NULL DEFAULT false,
  disabled boolean NOT NULL DEFAULT false,
  is_demo boolean NOT NULL DEFAULT false,
  max_active_runs integer NOT NULL DEFAULT 4 CHECK (max_active_runs > 0),
  max_nodes integer NOT NULL DEFAULT 200000 CHECK (max_nodes > 0),
  last_login_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

-- One-time password-reset links. Only a hash of the token is stored.
CREATE TABLE password_resets (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  token_hash text NOT NULL UNIQUE,
  expires_at timestamptz NOT NULL,
  used_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE projects (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  name text NOT NULL UNIQUE,
  description text NOT NULL DEFAULT '',
  is_demo boolean NOT NULL DEFAULT false,
  created_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE project_members (
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  role text NOT NULL CHECK (role IN ('admin', 'analyst', 'reviewer', 'viewer')),
  added_at timestamptz NOT NULL DEFAULT now(),
  PRIMARY KEY (project_id, user_id)
);
CREATE INDEX project_members_user_idx ON project_members(user_id);

-- Invitations into a project with a role; the account is created when the link is accepted.
CREATE TABLE invitations (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  email text NOT NULL CHECK (email = lower(email)),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  role text NOT NULL CHECK (role IN ('admin', 'analyst', 'reviewer', 'viewer')),
  token_hash text NOT NULL UNIQUE,
  expires_at timestamptz NOT NULL,
  accepted_at timestamptz,
  revoked_at timestamptz,
  invited_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE materials (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  name text NOT NULL,
  is_demo boolean NOT NULL DEFAULT false,
  description text NOT NULL DEFAULT '',
  created_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (project_id, name)
);

-- A material's parameter sets, numbered 1, 2, ...; approved and rejected versions are frozen.
CREATE TABLE material_versions (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  material_id uuid NOT NULL REFERENCES materials(id) ON DELETE CASCADE,
  version integer NOT NULL CHECK (version > 0),
  status text NOT NULL DEFAULT 'draft' CHECK (status IN ('draft', 'approved', 'rejected')),
  params jsonb NOT NULL,
  provenance jsonb NOT NULL DEFAULT '{}',
  notes text NOT NULL DEFAULT '',
  created_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  reviewed_by uuid REFERENCES users(id) ON DELETE SET NULL,
  reviewed_at timestamptz,
  review_reason text NOT NULL DEFAULT '',
  UNIQUE (material_id, version)
);

CREATE TABLE test_data (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  name text NOT NULL,
  is_demo boolean NOT NULL DEFAULT false,
  kind text NOT NULL CHECK (kind IN ('dsc', 'tensile', 'other')),
  -- Test temperature of an isothermal tensile curve (°C); null for DSC traces.
  temperature double precision,
  notes text NOT NULL DEFAULT '',
  file_name text NOT NULL,
  content_type text NOT NULL,
  size integer NOT NULL,
  content bytea NOT NULL,
  uploaded_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX test_data_project_idx ON test_data(project_id);

CREATE TABLE studies (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  name text NOT NULL,
  is_demo boolean NOT NULL DEFAULT false,
  description text NOT NULL DEFAULT '',
  definition jsonb NOT NULL,
  revision integer NOT NULL DEFAULT 1,
  created_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX studies_project_idx ON studies(project_id);

CREATE TABLE sweeps (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  study_id uuid NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  name text NOT NULL,
  variations jsonb NOT NULL,
  created_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);

-- One solve of a frozen snapshot (study + material versions + solver version).
CREATE TABLE runs (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  study_id uuid NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  sweep_id uuid REFERENCES sweeps(id) ON DELETE SET NULL,
  number integer NOT NULL,
  state text NOT NULL CHECK (state IN ('draft', 'queued', 'running', 'succeeded', 'failed', 'cancelled')),
  snapshot jsonb NOT NULL,
  solver_version text NOT NULL,
  job_id text,
  message text NOT NULL DEFAULT '',
  progress jsonb NOT NULL DEFAULT '{}',
  worker_id text,
  submitted_by uuid REFERENCES users(id) ON DELETE SET NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  queued_at timestamptz,
  started_at timestamptz,
  finished_at timestamptz,
  cancel_requested_at timestamptz,
  review_status text NOT NULL DEFAULT 'none' CHECK (review_status IN ('none', 'requested', 'approved', 'rejected')),
  reviewed_by uuid REFERENCES users(id) ON DELETE SET NULL,
  reviewed_at timestamptz,
  review_reason text NOT NULL DEFAULT '',
  UNIQUE (study_id, number)
);
CREATE INDEX runs_queue_idx ON runs(state, queued_at);
CREATE INDEX runs_submitter_idx ON runs(submitted_by, state);
CREATE INDEX runs_project_idx ON runs(project_id, created_at DESC);

-- Convergence log (one row per Newton iteration) and converged frames' history values.
CREATE TABLE run_iterations (
  run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  seq integer NOT NULL,
  segment integer NOT NULL,
  increment integer NOT NULL,
  iteration integer NOT NULL,
  time double precision NOT NULL,
  residual_norm double precision NOT NULL,
  correction_norm double precision NOT NULL,
  cut_backs integer NOT NULL,
  PRIMARY KEY (run_id, seq)
);

CREATE TABLE run_frames (
  run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  frame integer NOT NULL,
  segment integer NOT NULL,
  increment integer NOT NULL,
  time double precision NOT NULL,
  history jsonb NOT NULL DEFAULT '{}',
  PRIMARY KEY (run_id, frame)
);

-- Result files (fields per frame, VTU, CSV, ...), stored in chunks so that neither side holds a
-- whole large result in memory. storage = 'pg' keeps the bytes in run_artifact_chunks.
CREATE TABLE run_artifacts (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  name text NOT NULL,
  content_type text NOT NULL,
  size bigint NOT NULL DEFAULT 0,
  storage text NOT NULL DEFAULT 'pg' CHECK (storage IN ('pg', 's3')),
  storage_key text,
  complete boolean NOT NULL DEFAULT false,
  created_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (run_id, name)
);

CREATE TABLE run_artifact_chunks (
  artifact_id uuid NOT NULL REFERENCES run_artifacts(id) ON DELETE CASCADE,
  seq integer NOT NULL,
  bytes bytea NOT NULL,
  PRIMARY KEY (artifact_id, seq)
);

CREATE TABLE comments (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  project_id uuid NOT NULL REFERENCES projects(id) ON DELETE CASCADE,
  target_type text NOT NULL CHECK (target_type IN ('material-version', 'study', 'run')),
  target_id uuid NOT NULL,
  author_id uuid REFERENCES users(id) ON DELETE SET NULL,
  body text NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX comments_target_idx ON comments(target_type, target_id);

CREATE TABLE audit_log (
  id bigserial PRIMARY KEY,
  at timestamptz NOT NULL DEFAULT now(),
  user_id uuid REFERENCES users(id) ON DELETE SET NULL,
  project_id uuid REFERENCES projects(id) ON DELETE SET NULL,
  action text NOT NULL,
  target_type text NOT NULL,
  target_id text NOT NULL,
  detail jsonb NOT NULL DEFAULT '{}'
);
CREATE INDEX audit_log_project_idx ON audit_log(project_id, at DESC);

-- Mails received by the local fake SMTP server (development and tests only), readable by admins.
CREATE TABLE captured_mail (
  id bigserial PRIMARY KEY,
  from_address text NOT NULL,
  to_addresses text[] NOT NULL,
  subject text NOT NULL,
  text_body text NOT NULL,
  raw text NOT NULL,
  received_at timestamptz NOT NULL DEFAULT now()
);

-- Worker heartbeats for the admin's queue overview.
CREATE TABLE workers (
  id text PRIMARY KEY,
  hostname text NOT NULL,
  pid integer NOT NULL,
  version text NOT NULL DEFAULT '',
  started_at timestamptz NOT NULL DEFAULT now(),
  last_seen_at timestamptz NOT NULL DEFAULT now(),
  current_run_id uuid
);

-- express-session store (connect-pg-simple's table layout).
CREATE TABLE "session" (
  sid varchar NOT NULL PRIMARY KEY,
  sess json NOT NULL,
  expire timestamp(6) NOT NULL
);
CREATE INDEX session_expire_idx ON "session"(expire);

-- Socket.IO PostgreSQL adapter/emitter: payloads over the NOTIFY size limit or with binary data.
CREATE TABLE socket_io_attachments (
  id bigserial UNIQUE,
  created_at timestamptz DEFAULT now(),
  payload bytea
);
`);
  },
};
