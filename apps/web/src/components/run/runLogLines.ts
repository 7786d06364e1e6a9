/**
 * The run monitor's log: stored lines loaded over REST and live lines over Socket.IO, merged into
 * one list in seq order with no line twice. Both sources may deliver the same line (a live line
 * that arrives while the page is loading the stored ones), so lines are kept by seq. Live lines
 * without a seq (past the stored cap) follow the stored line they came after.
 */
import type { RunLogLevel } from '@phaseloop/shared';

export interface LogLineInput { seq?: number; level: RunLogLevel; message: string; at: string }

export interface ShownLogLine extends LogLineInput {
  /** Stable key for the list: the seq when stored, a running number otherwise. */
  key: string;
  /** Sort position: the seq, or just after the latest seq seen when the line has none. */
  order: number;
}

export interface RunLogBuffer {
  readonly lines: readonly ShownLogLine[];
  /** Adds lines, skipping seqs already shown; answers whether anything was added. */
  add(incoming: readonly LogLineInput[]): boolean;
}

/** At most this many lines are kept on screen (the stored log holds more only across attempts). */
export const SHOWN_LOG_LIMIT = 5000;

export function createRunLogBuffer(limit = SHOWN_LOG_LIMIT): RunLogBuffer {
  let lines: ShownLogLine[] = [];
  const seen = new Set<number>();
  let latestSeq = -1;
  let unstored = 0;
  return {
    get lines() { return lines; },
    add(incoming) {
      const fresh: ShownLogLine[] = [];
      for (const line of incoming) {
        if (line.seq !== undefined) {
          if (seen.has(line.seq)) continue;
          seen.add(line.seq);
          latestSeq = Math.max(latestSeq, line.seq);
          fresh.push({ ...line, key: `s${line.seq}`, order: line.seq });
        } else {
          unstored += 1;
          // Tiny steps keep unstored lines in arrival order between two stored seqs.
          fresh.push({ ...line, key: `u${unstored}`, order: latestSeq + unstored / 1e7 });
        }
      }
      if (fresh.length === 0) return false;
      const merged = [...lines, ...fresh].sort((a, b) => a.order - b.order);
      lines = merged.length > limit ? merged.slice(merged.length - limit) : merged;
      return true;
    },
  };
}
