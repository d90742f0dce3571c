// Runs the engine on the trips text and settings, off the UI thread, with a debounce for
// typing and none for pastes, drops, imports and settings. Only the latest answer is shown.
import { useEffect, useRef, useState } from 'preact/hooks';
import type { Analysis } from '../../shared/api/analysis-schema';
import type { LaylineApi } from '../../shared/api/contract';
import type { AnalysisSettings } from '../../shared/workspace/settings';

export const TYPING_DEBOUNCE_MS = 250;

export interface AnalysisState {
  readonly analysis: Analysis | null;
  /** True from an edit until its answer arrives. */
  readonly busy: boolean;
  readonly error: string | null;
}

interface Answer {
  readonly analysis: Analysis | null;
  readonly error: string | null;
  /** The inputs this answer is for; busy is derived by comparing them with the current ones. */
  readonly text: string | null;
  readonly settings: AnalysisSettings | null;
  readonly revision: number;
}

/** `bundleRevision` changes when the bundle in use changes, which scores the same input again at once. */
export function useAnalysis(api: LaylineApi, text: string, settings: AnalysisSettings, bundleRevision = 0): AnalysisState & { skipNextDebounce: () => void } {
  const [answer, setAnswer] = useState<Answer>({ analysis: null, error: null, text: null, settings: null, revision: bundleRevision });
  const latest = useRef(0);
  const immediate = useRef(true);
  const lastSettings = useRef(settings);
  const lastRevision = useRef(bundleRevision);

  useEffect(() => {
    const id = ++latest.current;
    const settingsChanged = lastSettings.current !== settings || lastRevision.current !== bundleRevision;
    lastSettings.current = settings;
    lastRevision.current = bundleRevision;
    const run = () => {
      api.analyzeTrips(text, settings).then(
        (analysis) => {
          if (id !== latest.current) return;
          // Lets the benchmark split engine time from rendering time.
          performance.mark('layline:analysis-arrived');
          setAnswer({ analysis, error: null, text, settings, revision: bundleRevision });
        },
        (err: unknown) => {
          if (id !== latest.current) return;
          setAnswer((a) => ({ ...a, error: err instanceof Error ? err.message : String(err), text, settings, revision: bundleRevision }));
        },
      );
    };
    if (immediate.current || settingsChanged) {
      immediate.current = false;
      run();
      return undefined;
    }
    const timer = setTimeout(run, TYPING_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [api, text, settings, bundleRevision]);

  // Derived while rendering, so the screen never shows an old answer as current.
  const busy = answer.text !== text || answer.settings !== settings || answer.revision !== bundleRevision;
  return { analysis: answer.analysis, error: answer.error, busy, skipNextDebounce: () => (immediate.current = true) };
}
