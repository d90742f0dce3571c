// A one-line progress bar on stderr for long fits, redrawn in place with a carriage return.
import type { FitProgress } from '../../../shared/inference/fit-types';
import type { CliIo } from '../io';

const WIDTH = 30;

export interface ProgressBar {
  update(progress: FitProgress): void;
  /** Ends the line so later output starts clean. */
  done(): void;
}

/** A bar when stderr is a terminal; otherwise nothing is drawn (logs stay clean). */
export function createProgressBar(io: CliIo, label: string): ProgressBar {
  if (!io.stderrIsTty) return { update: () => {}, done: () => {} };
  let drawn = false;
  return {
    update(p) {
      const fraction = Math.min(1, Math.max(0, p.fraction));
      const filled = Math.round(fraction * WIDTH);
      const objective = Number.isFinite(p.objective) ? p.objective.toPrecision(6) : String(p.objective);
      io.stderr(`\r${label} [${'#'.repeat(filled)}${'-'.repeat(WIDTH - filled)}] ${(fraction * 100).toFixed(0).padStart(3)}%  objective ${objective}\x1b[K`);
      drawn = true;
    },
    done() {
      if (drawn) io.stderr('\n');
    },
  };
}
