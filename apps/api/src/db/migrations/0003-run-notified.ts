/** When the end of a run was announced (notification + mail), so only one API instance announces it. */
import type { Migration } from '../migrate';

export const runNotifiedSchema: Migration = {
  name: '0003-run-notified',
  async up({ context: sql }) {
    await sql(`
ALTER TABLE runs ADD COLUMN notified_at timestamptz;
-- Runs that ended before this column existed are not announced again.
UPDATE runs SET notified_at = coalesce(finished_at, now()) WHERE state IN ('succeeded', 'failed', 'cancelled');
CREATE INDEX runs_unnotified_idx ON runs(finished_at) WHERE notified_at IS NULL AND state IN ('succeeded', 'failed');
`);
  },
};
