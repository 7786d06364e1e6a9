/**
 * The run log: the solver's and worker's own lines (model size, cut-backs, the outcome), kept so
 * that the run monitor shows a run's past lines, not only those that arrived while it was open.
 * Lines of every attempt are kept (an earlier attempt's lines explain why a run was restarted);
 * `seq` counts on across attempts so a page of lines is one ordered list per run. The worker
 * keeps at most a fixed number of lines per attempt (RUN_LOG_MAX_LINES_PER_ATTEMPT in
 * packages/shared/src/runs.ts) and writes a last line saying that later lines were not stored.
 */
import type { Migration } from '../migrate';

export const runLogLinesSchema: Migration = {
  name: '0005-run-log-lines',
  async up({ context: sql }) {
    await sql(`
CREATE TABLE run_log_lines (
  run_id uuid NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  seq integer NOT NULL CHECK (seq >= 0),
  attempt integer NOT NULL CHECK (attempt >= 1),
  level text NOT NULL CHECK (level IN ('info', 'warn', 'error')),
  message text NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  -- Also the run + seq index that paging with afterSeq reads.
  PRIMARY KEY (run_id, seq)
);
`);
  },
};
