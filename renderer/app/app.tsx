// The root component. Later screens hang off this shell.
import { useEffect, useState } from 'preact/hooks';
import type { AppInfo, LaylineApi } from '../../shared/api/contract';

export function App({ api }: { api: LaylineApi }) {
  const [info, setInfo] = useState<AppInfo | null>(null);
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    api.getAppInfo().then(setInfo, (err: unknown) => setError(err instanceof Error ? err.message : String(err)));
  }, [api]);
  return (
    <main class="shell">
      <header class="shell-header">
        <h1>Layline</h1>
        <p class="tagline">How likely is each connection to hold?</p>
      </header>
      <section aria-label="About this copy">
        {error ? (
          <p role="alert">The engine did not answer: {error}</p>
        ) : info ? (
          <p data-testid="app-info">
            {info.name} {info.version}, engine running in the {info.runtime === 'web' ? 'page worker' : 'desktop app'}.
          </p>
        ) : (
          <p aria-busy="true">Starting the engine…</p>
        )}
      </section>
      <footer class="caution">Estimates from historical delay data, not guarantees. Airline rules and local regulations decide.</footer>
    </main>
  );
}
