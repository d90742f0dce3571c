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

export function useAnalysis(api: LaylineApi, text: string, settings: AnalysisSettings): AnalysisState & { skipNextDebounce: () => void } {
  const [state, setState] = useState<AnalysisState>({ analysis: null, busy: true, error: null });
  const latest = useRef(0);
  const immediate = useRef(true);
  const lastSettings = useRef(settings);

  useEffect(() => {
    const id = ++latest.current;
    const settingsChanged = lastSettings.current !== settings;
    lastSettings.current = settings;
    setState((s) => (s.busy ? s : { ...s, busy: true }));
    const run = () => {
      api.analyzeTrips(text, settings).then(
        (analysis) => {
          if (id !== latest.current) return;
          // Lets the benchmark split engine time from rendering time.
          performance.mark('layline:analysis-arrived');
          setState({ analysis, busy: false, error: null });
        },
        (err: unknown) => {
          if (id !== latest.current) return;
          setState((s) => ({ ...s, busy: false, error: err instanceof Error ? err.message : String(err) }));
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
  }, [api, text, settings]);

  return { ...state, skipNextDebounce: () => (immediate.current = true) };
}
