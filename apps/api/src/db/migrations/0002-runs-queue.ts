/**
 * Runs issue: attempts (a run restarted after its worker died), queue priority set by admins,
 * who cancelled, soft-deleted studies, notifications, e-mail opt-out and personal API tokens.
 */
import type { Migration } from '../migrate';

export const runsQueueSchema: Migration = {
  name: '0002-runs-queue',
  async up({ context: sql }) {
    await sql(`
ALTER TABLE runs ADD COLUMN attempts integer NOT NULL DEFAULT 0;
ALTER TABLE runs ADD COLUMN priority integer NOT NULL DEFAULT 0;
ALTER TABLE runs ADD COLUMN cancelled_by uuid REFERENCES users(id) ON DELETE SET NULL;
ALTER TABLE runs ADD COLUMN deleted_at timestamptz;

ALTER TABLE studies ADD COLUMN deleted_at timestamptz;
ALTER TABLE studies ADD COLUMN deleted_by uuid REFERENCES users(id) ON DELETE SET NULL;

ALTER TABLE users ADD COLUMN notify_by_email boolean NOT NULL DEFAULT true;

CREATE TABLE notifications (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  kind text NOT NULL,
  title text NOT NULL,
  body text NOT NULL DEFAULT '',
  link text NOT NULL DEFAULT '',
  run_id uuid REFERENCES runs(id) ON DELETE CASCADE,
  read_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX notifications_user_idx ON notifications(user_id, created_at DESC);

-- Personal API tokens: only a SHA-256 of the token is kept; the token is shown once.
CREATE TABLE api_tokens (
  id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
  user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
  name text NOT NULL,
  token_hash text NOT NULL UNIQUE,
  prefix text NOT NULL,
  last_used_at timestamptz,
  revoked_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX api_tokens_user_idx ON api_tokens(user_id);
`);
  },
};
