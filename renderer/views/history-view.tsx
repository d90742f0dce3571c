// Delay history: the bundles Layline can score with (switch between them), and a fit of the
// organisation's own delay history: pick a file, check the column mapping, run the fit in the
// engine's worker with a progress bar, ETA, live objective chart and Cancel, then read the
// held-out diagnostics and choose whether to use the new bundle.
//
// The screen stays mounted while other tabs are shown, so a fit keeps running and reporting.
import { useEffect, useMemo, useRef, useState } from 'preact/hooks';
import type { BundleView } from '../../shared/api/analysis-schema';
import type { LaylineApi, RequestResult } from '../../shared/api/contract';
import { HISTORY_FIELD_LABELS, HISTORY_FIELDS, REQUIRED_HISTORY_FIELDS } from '../../shared/history/columns';
import { HISTORY_FIT_METHODS, type HistoryFitMethod } from '../../shared/history/fit-methods';
import type { HistoryFileRef } from '../../shared/history/history-requests';
import { ChartCanvas } from '../charts/chart-canvas';
import { objectiveTraceConfig, qqConfig, type ChartColors } from '../charts/chart-configs';
import { pickFile } from '../app/page-files';
import { count } from '../app/format';
import { duplicateColumns, formatDuration, formatRelativeError, formatTailPercent, initialChoice, missingRequired, overridesFor, type ColumnChoice } from '../state/history-form';

type Preview = RequestResult<'previewHistory'>;
type JobStatus = RequestResult<'historyFitStatus'>;
type Summary = NonNullable<JobStatus['summary']>;
type KindSummary = Summary['heldOut']['arrival'];
type TailRow = KindSummary['calibration'][number];
type Library = RequestResult<'listBundles'>;

const POLL_MS = 400;
const HISTORY_FILE_TYPES = '.csv,.tsv,.txt,.parquet,text/csv,text/plain';

const METHOD_WORDS: Record<HistoryFitMethod, string> = {
  map: 'MAP (maximum a posteriori, fastest)',
  advi: 'ADVI (variational, full data)',
  svi: 'SVI (variational, minibatches)',
};

interface ChosenFile {
  readonly ref: HistoryFileRef;
  readonly name: string;
  readonly bytes: number;
}

function message(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

function megabytes(bytes: number): string {
  return bytes >= 1e6 ? `${(bytes / 1e6).toFixed(1)} MB` : `${Math.max(1, Math.round(bytes / 1e3))} kB`;
}

export interface HistoryViewProps {
  readonly api: LaylineApi;
  readonly desktop: boolean;
  readonly colors: ChartColors;
  /** The bundle in use changed: the app reloads its info and scores again. */
  readonly onBundleChanged: (text: string) => void;
  /** A one-line state of a running fit for the header, or null when none runs. */
  readonly onFitActivity: (line: string | null) => void;
}

export function HistoryView({ api, desktop, colors, onBundleChanged, onFitActivity }: HistoryViewProps) {
  const [library, setLibrary] = useState<Library | null>(null);
  const [libraryError, setLibraryError] = useState<string | null>(null);
  const [file, setFile] = useState<ChosenFile | null>(null);
  const [preview, setPreview] = useState<Preview | null>(null);
  const [choice, setChoice] = useState<ColumnChoice | null>(null);
  const [method, setMethod] = useState<HistoryFitMethod>('map');
  const [holdoutAfter, setHoldoutAfter] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [job, setJob] = useState<JobStatus | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const polling = useRef<string | null>(null);

  const refreshLibrary = async () => {
    try {
      setLibrary(await api.listBundles());
      setLibraryError(null);
    } catch (err) {
      setLibraryError(`The bundle list could not be read: ${message(err)}`);
    }
  };

  useEffect(() => {
    void refreshLibrary();
  }, [api]);

  // Poll the running job until it finishes.
  useEffect(() => {
    if (!job || (job.state !== 'reading' && job.state !== 'fitting')) {
      onFitActivity(null);
      return undefined;
    }
    onFitActivity(`Fitting delay history: ${Math.round(job.fraction * 100)}%`);
    const id = job.jobId;
    polling.current = id;
    const timer = setTimeout(() => {
      api.historyFitStatus(id).then(
        (s) => polling.current === id && setJob(s),
        (err: unknown) => setError(`Lost track of the fit: ${message(err)}`),
      );
    }, POLL_MS);
    return () => clearTimeout(timer);
  }, [api, job]);

  const choose = async () => {
    setError(null);
    try {
      let chosen: ChosenFile | null = null;
      if (desktop) {
        const r = await api.chooseHistoryFile();
        if (r.status === 'chosen') chosen = { ref: { kind: 'path', path: r.path }, name: r.name, bytes: r.bytes };
      } else {
        const picked = await pickFile(HISTORY_FILE_TYPES);
        if (picked) chosen = { ref: { kind: 'blob', name: picked.name, blob: picked }, name: picked.name, bytes: picked.size };
      }
      if (!chosen) return;
      setBusy(true);
      setFile(chosen);
      setPreview(null);
      setChoice(null);
      const p = await api.previewHistory(chosen.ref);
      setPreview(p);
      setChoice(initialChoice(p));
    } catch (err) {
      setError(`The file could not be read: ${message(err)} Nothing was imported.`);
    } finally {
      setBusy(false);
    }
  };

  const start = async () => {
    if (!file || !choice) return;
    setError(null);
    setSaved(null);
    try {
      const { jobId } = await api.startHistoryFit({
        source: file.ref,
        overrides: overridesFor(choice),
        method,
        ...(holdoutAfter ? { holdoutAfter } : {}),
      });
      setJob(await api.historyFitStatus(jobId));
    } catch (err) {
      setError(`The fit did not start: ${message(err)}`);
    }
  };

  const cancel = async () => {
    if (!job) return;
    try {
      await api.cancelHistoryFit(job.jobId);
    } catch (err) {
      setError(`Could not cancel: ${message(err)}`);
    }
  };

  const useNewBundle = async () => {
    if (!job) return;
    try {
      const entry = await api.saveFittedBundle(job.jobId);
      await api.useBundle({ kind: 'library', id: entry.id });
      setSaved(entry.id);
      await refreshLibrary();
      onBundleChanged(`Now scoring with ${entry.view.id}, fitted to ${file?.name ?? 'your history'}. The bundled default is one click away under Delay history.`);
    } catch (err) {
      setError(`The bundle was not switched: ${message(err)} The bundle in use is unchanged.`);
    }
  };

  const switchTo = async (target: { kind: 'default' } | { kind: 'library'; id: string }, label: string) => {
    try {
      await api.useBundle(target);
      await refreshLibrary();
      onBundleChanged(`Now scoring with ${label}.`);
    } catch (err) {
      setError(`The bundle was not switched: ${message(err)}`);
    }
  };

  const running = job !== null && (job.state === 'reading' || job.state === 'fitting');
  const missing = choice ? missingRequired(choice) : [];
  const duplicates = choice ? duplicateColumns(choice) : [];

  return (
    <section class="history" aria-labelledby="history-title">
      <h2 id="history-title">Delay history and bundles</h2>
      <p class="hint">
        Layline scores connections against a bundle of route posteriors. The one that ships with it comes from a public sample of U.S. domestic flights in 2001. Fit a bundle to your own delay records, or to recent public on-time data for the routes you book, check how well it predicts the most recent month it did not see, and then choose whether to use it.
      </p>
      {error && (
        <div class="banner error" role="alert">
          {error}
        </div>
      )}

      <BundleList library={library} error={libraryError} onUse={switchTo} />

      <h3>Fit from your own delay history</h3>
      <div class="button-row">
        <button type="button" onClick={() => void choose()} disabled={running || busy}>
          Choose a delay history file…
        </button>
        <span class="muted">CSV (comma, semicolon, tab or pipe) or Parquet. The U.S. BTS on-time performance columns are recognised by name.</span>
      </div>
      {busy && <p aria-busy="true">Reading the file's columns…</p>}
      {file && preview && choice && (
        <ColumnMapping
          file={file}
          preview={preview}
          choice={choice}
          onChoice={setChoice}
          disabled={running}
        />
      )}
      {file && preview && choice && (
        <div class="fit-options">
          <label class="field">
            <span>Method</span>
            <select value={method} onChange={(e) => setMethod(e.currentTarget.value as HistoryFitMethod)} disabled={running}>
              {HISTORY_FIT_METHODS.map((m) => (
                <option key={m} value={m}>
                  {METHOD_WORDS[m]}
                </option>
              ))}
            </select>
          </label>
          <label class="field">
            <span>Hold out flights after (optional)</span>
            <input type="date" value={holdoutAfter} onInput={(e) => setHoldoutAfter(e.currentTarget.value)} disabled={running} />
            <span class="muted">Empty: the last month of the file is held out.</span>
          </label>
          <div class="button-row">
            <button type="button" class="primary" onClick={() => void start()} disabled={running || missing.length > 0 || duplicates.length > 0}>
              Fit and check
            </button>
            {missing.length > 0 && <span class="field-error">Choose a column for: {missing.map((f) => HISTORY_FIELD_LABELS[f]).join(', ')}.</span>}
            {duplicates.length > 0 && <span class="field-error">Each column can hold one field; used twice: {duplicates.join(', ')}.</span>}
          </div>
        </div>
      )}

      {job && <FitProgress job={job} colors={colors} onCancel={() => void cancel()} />}
      {job?.state === 'done' && job.summary && (
        <FitDiagnostics summary={job.summary} colors={colors} saved={saved} onUse={() => void useNewBundle()} />
      )}
    </section>
  );
}

function BundleList({ library, error, onUse }: { library: Library | null; error: string | null; onUse: (target: { kind: 'default' } | { kind: 'library'; id: string }, label: string) => void }) {
  if (error) return <p class="field-error">{error}</p>;
  if (!library) return <p aria-busy="true">Reading the bundles…</p>;
  const defaultActive = library.active.kind === 'default';
  const defaultBundle: BundleView = library.default;
  return (
    <div class="table-wrap">
      <table class="data-table" aria-label="Bundles">
        <thead>
          <tr>
            <th scope="col">Bundle</th>
            <th scope="col">Source</th>
            <th scope="col">Flights</th>
            <th scope="col">Departures</th>
            <th scope="col">Held-out score</th>
            <th scope="col">Scoring with</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <td>
              <strong>Bundled with Layline</strong>
              <span class="trip-name">{defaultBundle.id}</span>
            </td>
            <td>{defaultBundle.provenance ? `${defaultBundle.provenance.title}; ${defaultBundle.provenance.dateFirst} to ${defaultBundle.provenance.dateLast}; ${defaultBundle.provenance.license}` : defaultBundle.source}</td>
            <td class="num">{defaultBundle.provenance ? defaultBundle.provenance.flights.toLocaleString('en-US') : ''}</td>
            <td>derived from arrivals</td>
            <td class="muted">see the README's methods</td>
            <td>
              {defaultActive ? (
                <span class="badge">In use</span>
              ) : (
                <button type="button" onClick={() => onUse({ kind: 'default' }, 'the bundle that ships with Layline')}>
                  Use the bundled default
                </button>
              )}
            </td>
          </tr>
          {library.entries.map((e) => (
            <tr key={e.id}>
              <td>
                <strong>{e.view.provenance?.title ?? e.id}</strong>
                <span class="trip-name">
                  {e.id}, fitted {new Date(e.createdAt).toLocaleString()}
                </span>
              </td>
              <td>
                {e.view.source}
                {e.view.provenance && (
                  <span class="trip-name">
                    {e.view.provenance.dateFirst} to {e.view.provenance.dateLast}; {count(e.view.provenance.routes, 'route')}, {count(e.view.provenance.airports, 'airport')}; {e.view.provenance.method}; kept at {e.file}
                  </span>
                )}
              </td>
              <td class="num">{e.view.provenance ? e.view.provenance.flights.toLocaleString('en-US') : ''}</td>
              <td>{e.departures === 'fitted' ? 'fitted directly' : 'derived from arrivals'}</td>
              <td>
                {e.heldOut.map((h) => (
                  <span key={`${h.candidate}/${h.split}`} class="trip-name">
                    {h.split}: {h.natsPerFlight.toFixed(3)} nats/flight over {h.flights.toLocaleString('en-US')} flights
                  </span>
                ))}
              </td>
              <td>
                {e.active ? (
                  <span class="badge">In use</span>
                ) : (
                  <button type="button" onClick={() => onUse({ kind: 'library', id: e.id }, e.id)} aria-label={`Use ${e.id}`}>
                    Use this bundle
                  </button>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {library.unreadable.length > 0 && (
        <div class="banner error" role="status">
          {count(library.unreadable.length, 'file')} in the bundle folder could not be read and {library.unreadable.length === 1 ? 'is' : 'are'} not offered:
          <ul>
            {library.unreadable.map((u) => (
              <li key={u.file}>
                {u.file}: {u.reason}
              </li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}

function ColumnMapping({ file, preview, choice, onChoice, disabled }: { file: ChosenFile; preview: Preview; choice: ColumnChoice; onChoice: (c: ColumnChoice) => void; disabled: boolean }) {
  const header = preview.detection.header;
  return (
    <div class="mapping">
      <p>
        <strong>{file.name}</strong> ({megabytes(file.bytes)}, {preview.format === 'parquet' ? 'Parquet' : 'delimited text'}).{' '}
        {preview.detection.layout === 'bts' ? 'Recognised the U.S. BTS on-time performance layout: delays are actual minus scheduled minutes, negative when early.' : 'Check that each field below points at the right column.'}
      </p>
      <table class="data-table mapping-table" aria-label="Column mapping">
        <thead>
          <tr>
            <th scope="col">Field</th>
            <th scope="col">Column in the file</th>
            <th scope="col">First values</th>
          </tr>
        </thead>
        <tbody>
          {HISTORY_FIELDS.map((field) => {
            const column = choice[field];
            const index = column === null ? -1 : header.indexOf(column);
            const required = REQUIRED_HISTORY_FIELDS.includes(field);
            return (
              <tr key={field}>
                <th scope="row">
                  {HISTORY_FIELD_LABELS[field]}
                  {required && <span class="muted"> (required)</span>}
                </th>
                <td>
                  <select
                    aria-label={`Column for ${HISTORY_FIELD_LABELS[field]}`}
                    value={column ?? ''}
                    disabled={disabled}
                    onChange={(e) => onChoice({ ...choice, [field]: e.currentTarget.value === '' ? null : e.currentTarget.value })}
                  >
                    <option value="">{required ? '(choose a column)' : '(not in this file)'}</option>
                    {header.map((h) => (
                      <option key={h} value={h}>
                        {h}
                      </option>
                    ))}
                  </select>
                </td>
                <td class="muted">{index >= 0 ? preview.sampleRows.map((r) => r[index] ?? '').join(' · ') : ''}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {preview.format === 'parquet' && <p class="muted">Parquet files are previewed by their schema only; the values are checked as the file is read.</p>}
    </div>
  );
}

function FitProgress({ job, colors, onCancel }: { job: JobStatus; colors: ChartColors; onCancel: () => void }) {
  const running = job.state === 'reading' || job.state === 'fitting';
  const last = job.trace[job.trace.length - 1];
  const title = last ? `${last.kind}: ${last.stage === 'fit-holdout' ? 'fit without the held-out month' : last.stage === 'fit-all' ? 'refit on everything' : 'scoring the held-out month'}` : 'the fit';
  const config = useMemo(() => objectiveTraceConfig(job.trace, title, colors), [job.trace, title, colors]);
  const percent = Math.round(job.fraction * 100);
  return (
    <div class="fit-progress" aria-labelledby="fit-progress-title">
      <h3 id="fit-progress-title">Fit</h3>
      <div class="button-row">
        <progress max={100} value={percent} aria-label="Fit progress" aria-valuetext={`${percent}%, ${job.label}`} />
        <span role="status" aria-live="polite" data-testid="fit-status">
          {running ? `${percent}%: ${job.label}. Elapsed ${formatDuration(job.elapsedMs)}, about ${formatDuration(job.etaMs)} left.` : `${job.state === 'done' ? 'Done' : job.state === 'cancelled' ? 'Cancelled' : 'Failed'} after ${formatDuration(job.elapsedMs)}.`}
        </span>
        {running && (
          <button type="button" onClick={onCancel}>
            Cancel the fit
          </button>
        )}
      </div>
      {job.state === 'failed' && (
        <div class="banner error" role="alert">
          The fit failed: {job.error} The bundle in use is unchanged.
        </div>
      )}
      {job.state === 'cancelled' && <p role="status">The fit was cancelled. Nothing was saved; the bundle in use is unchanged.</p>}
      {job.trace.length > 1 && <ChartCanvas config={config} description={`Log posterior by iteration for ${title}; ${job.trace.length} points so far.`} testId="objective-chart" height={200} />}
    </div>
  );
}

function TailTable({ rows, label }: { rows: readonly TailRow[]; label: string }) {
  return (
    <table class="data-table calibration-table" aria-label={label}>
      <thead>
        <tr>
          <th scope="col">Delay over</th>
          <th scope="col">Held out</th>
          <th scope="col">Predicted</th>
          <th scope="col">90% interval</th>
          <th scope="col">Relative error</th>
          <th scope="col">Covered</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.minutes}>
            <td class="num">{r.minutes} min</td>
            <td class="num">{formatTailPercent(r.observed)}</td>
            <td class="num">{formatTailPercent(r.predicted)}</td>
            <td class="num">
              {formatTailPercent(r.interval[0])} – {formatTailPercent(r.interval[1])}
            </td>
            <td class="num">{formatRelativeError(r.relativeError)}</td>
            <td>{r.covered ? 'yes' : 'no'}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function KindDiagnostics({ kind, summary, colors }: { kind: 'arrival' | 'departure'; summary: KindSummary; colors: ChartColors }) {
  const config = useMemo(() => qqConfig(summary.qq, `${kind} delay quantiles`, colors), [summary.qq, kind, colors]);
  const base = summary.baseline;
  const diff = base ? summary.natsPerFlight - base.natsPerFlight : null;
  return (
    <div class="kind-diagnostics">
      <h4>{kind === 'arrival' ? 'Arrival delays' : 'Departure delays (fitted directly)'}</h4>
      <p data-testid={`${kind}-score`}>
        Held-out log score: <strong>{summary.natsPerFlight.toFixed(3)} nats per flight</strong> over {summary.flights.toLocaleString('en-US')} flights
        {base && diff !== null && (
          <>
            {' '}
            against {base.natsPerFlight.toFixed(3)} for {base.name}: the new fit is {diff >= 0 ? 'better' : 'worse'} by {Math.abs(diff).toFixed(3)} nats per flight (higher is better).
          </>
        )}
      </p>
      <TailTable rows={summary.calibration} label={`${kind} tail calibration, pooled`} />
      {base && (
        <details>
          <summary>The bundle in use on the same held-out flights</summary>
          <TailTable rows={base.pooled} label={`${kind} tail calibration of the bundle in use`} />
        </details>
      )}
      <ChartCanvas config={config} description={`QQ plot of predicted against held-out ${kind} delay quantiles, ${summary.qq.length} quantiles.`} testId={`${kind}-qq`} height={260} />
      {summary.busiestRoutes.length > 0 && (
        <details>
          <summary>Tail calibration on the {count(summary.busiestRoutes.length, 'busiest route')}</summary>
          {summary.busiestRoutes.map((r) => (
            <div key={`${r.origin}-${r.destination}`}>
              <h5>
                {r.origin}–{r.destination} ({r.flights.toLocaleString('en-US')} held-out flights)
              </h5>
              <TailTable rows={r.rows} label={`${kind} tail calibration ${r.origin}-${r.destination}`} />
            </div>
          ))}
          <p class="muted">
            Median relative error across routes:{' '}
            {summary.routeMedianAbsRelativeError.map((m) => `${m.minutes} min ${m.median === null ? '—' : `${(m.median * 100).toFixed(0)}%`} (${m.routes} routes)`).join('; ')}.
          </p>
        </details>
      )}
    </div>
  );
}

function FitDiagnostics({ summary, colors, saved, onUse }: { summary: Summary; colors: ChartColors; saved: string | null; onUse: () => void }) {
  const imp = summary.import;
  return (
    <div class="fit-diagnostics" aria-labelledby="diagnostics-title">
      <h3 id="diagnostics-title">How well the fit predicts the held-out flights</h3>
      <p>
        Read {imp.rows.toLocaleString('en-US')} rows from {imp.firstDate ?? '?'} to {imp.lastDate ?? '?'}: {imp.flights.toLocaleString('en-US')} flights with a delay, {count(imp.cancelled, 'cancelled flight')} and {count(imp.diverted, 'diverted flight')} (counted apart, never as on time), {count(imp.invalid, 'invalid row')}.
        Flights after {summary.holdout.holdoutAfter}
        {summary.holdout.defaulted ? ' (the last month)' : ''} were held out: {summary.holdout.fitFlights.toLocaleString('en-US')} fitted, {summary.holdout.heldOutFlights.toLocaleString('en-US')} scored. Model {summary.family}, method {summary.method}, {formatDuration(summary.elapsedMs)}.
      </p>
      {imp.invalidByReason.length > 0 && (
        <details>
          <summary>Invalid rows by reason</summary>
          <ul>
            {imp.invalidByReason.map((r) => (
              <li key={r.reason}>
                {r.label}: {r.count.toLocaleString('en-US')}
                {r.samples.length > 0 && (
                  <ul>
                    {r.samples.map((s) => (
                      <li key={s.row} class="muted">
                        row {s.row}: {Object.entries(s.cells).map(([k, v]) => `${k}=${v}`).join(', ')}
                      </li>
                    ))}
                  </ul>
                )}
              </li>
            ))}
          </ul>
        </details>
      )}
      <KindDiagnostics kind="arrival" summary={summary.heldOut.arrival} colors={colors} />
      {summary.heldOut.departure && <KindDiagnostics kind="departure" summary={summary.heldOut.departure} colors={colors} />}
      <p class="hint">
        These are checks on past flights, not guarantees about future ones. The saved bundle is refitted on all {imp.flights.toLocaleString('en-US')} flights ({count(summary.bundle.routes, 'route')}, {count(summary.bundle.airports, 'airport')}, {megabytes(summary.bundle.bytes)}).
      </p>
      <div class="button-row">
        {saved ? (
          <span role="status" class="badge">
            In use: {saved}
          </span>
        ) : (
          <button type="button" class="primary" onClick={onUse}>
            Use this bundle
          </button>
        )}
      </div>
    </div>
  );
}
