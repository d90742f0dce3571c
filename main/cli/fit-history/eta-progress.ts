// A progress display with an estimated time remaining, on stderr: a bar redrawn in place on a
// terminal, or one plain line per stage when stderr is a file or pipe (logs stay readable).
import type { CliIo } from '../io';

const WIDTH = 28;

export interface EtaProgress {
  /** fraction: the whole job's share done (0..1); label: what is happening now. */
  update(fraction: number, label: string): void;
  /** Ends the display so later output starts on a clean line. */
  done(): void;
}

/** "1:05" style minutes:seconds, or "h:mm:ss" beyond an hour. */
export function formatDuration(ms: number): string {
  const total = Math.max(0, Math.round(ms / 1000));
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = String(total % 60).padStart(2, '0');
  return h > 0 ? `${h}:${String(m).padStart(2, '0')}:${s}` : `${m}:${s}`;
}

/**
 * Remaining time by linear extrapolation of the elapsed time over the fraction done; null until
 * enough is done (2%) for the estimate to mean anything.
 */
export function estimateRemainingMs(elapsedMs: number, fraction: number): number | null {
  if (!(fraction >= 0.02) || fraction >= 1) return fraction >= 1 ? 0 : null;
  return (elapsedMs / fraction) * (1 - fraction);
}

export function createEtaProgress(io: CliIo, now: () => number = () => Date.now()): EtaProgress {
  const started = now();
  let lastLabel = '';
  let lastStage = '';
  let lastDrawMs = -Infinity;
  let drawn = false;
  return {
    update(fraction, label) {
      const f = Math.min(1, Math.max(0, Number.isFinite(fraction) ? fraction : 0));
      const t = now();
      const remaining = estimateRemainingMs(t - started, f);
      const eta = remaining === null ? 'ETA --:--' : `ETA ${formatDuration(remaining)}`;
      const percent = `${(f * 100).toFixed(0).padStart(3)}%`;
      if (io.stderrIsTty) {
        if (t - lastDrawMs < 100 && label === lastLabel && f < 1) return;
        const filled = Math.round(f * WIDTH);
        io.stderr(`\r[${'#'.repeat(filled)}${'-'.repeat(WIDTH - filled)}] ${percent}  ${eta}  ${label}\x1b[K`);
        drawn = true;
      } else {
        // One line per stage: labels that differ only in their counts ("12000 rows") are one stage.
        const stage = label.replace(/\d+/g, '#');
        if (stage !== lastStage) io.stderr(`${percent}  ${eta}  ${label}\n`);
        lastStage = stage;
      }
      lastDrawMs = t;
      lastLabel = label;
    },
    done() {
      if (drawn) io.stderr('\n');
      drawn = false;
    },
  };
}
