// The root component: holds the workspace and its undo history, runs the engine, and
// switches between the screens. Logic lives in renderer/state (pure) and shared/.
import { useCallback, useEffect, useMemo, useRef, useState } from 'preact/hooks';
import type { BundleView, ConnectionCurve } from '../../shared/api/analysis-schema';
import type { ReportExportKind } from '../../shared/api/contract';
import type { AppEvent, AppInfo, LaylineApi, MenuCommand } from '../../shared/api/contract';
import { DEMO_ORGANISATION, DEMO_SCENARIO, DEMO_WORKSPACE } from '../../shared/demo/demo-workspace';
import { EMPTY_WORKSPACE, type WorkspaceContent } from '../../shared/workspace/format';
import type { AnalysisSettings, ThemeChoice } from '../../shared/workspace/settings';
import { readChartColors, type ChartColors } from '../charts/chart-configs';
import { editContent, editSettings, editTripsText, editView, isDirty, markSaved, openDocument, type DocumentModel, type TableView } from '../state/app-state';
import { canRedo, canUndo, redo, undo } from '../state/history';
import type { TripFilter } from '../state/trip-table';
import { ConnectionDetail } from '../views/connection-detail';
import { GroupView } from '../views/group-view';
import { HistoryView } from '../views/history-view';
import { IntakeView } from '../views/intake-view';
import { OptionsView, optionGroups } from '../views/options-view';
import { SettingsView } from '../views/settings-view';
import { TargetInput } from '../views/target-input';
import { TripsView, type Selection } from '../views/trips-view';
import { clearPageAutosave, downloadText, downloadWorkspace, isFirstStart, pickFile, readPageAutosave, readTextFile, readWorkspaceUpload, TRIP_FILE_TYPES, writePageAutosave } from './page-files';
import { count } from './format';
import { useAnalysis } from './use-analysis';

type Tab = 'intake' | 'trips' | 'options' | 'group' | 'history' | 'settings';
const TABS: readonly { id: Tab; label: string }[] = [
  { id: 'intake', label: 'Intake' },
  { id: 'trips', label: 'Trips' },
  { id: 'options', label: 'Options' },
  { id: 'group', label: 'Group' },
  { id: 'history', label: 'Delay history' },
  { id: 'settings', label: 'Settings' },
];

const AUTOSAVE_DELAY_MS = 2000;

interface Notice {
  readonly kind: 'error' | 'info';
  readonly text: string;
}

function message(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

/** Sets the page's palette; 'system' follows the OS (in Electron, nativeTheme drives the same media query). */
function applyTheme(theme: ThemeChoice): void {
  const dark = theme === 'dark' || (theme === 'system' && matchMedia('(prefers-color-scheme: dark)').matches);
  document.documentElement.dataset.theme = dark ? 'dark' : 'light';
}

export function App({ api }: { api: LaylineApi }) {
  const [info, setInfo] = useState<AppInfo | null>(null);
  const [doc, setDoc] = useState<DocumentModel>(() => openDocument(EMPTY_WORKSPACE, null));
  const [tab, setTab] = useState<Tab>('intake');
  const [notice, setNotice] = useState<Notice | null>(null);
  const [recovery, setRecovery] = useState<{ savedAt: string; content: WorkspaceContent } | null>(null);
  const [selection, setSelection] = useState<Selection | null>(null);
  const [curve, setCurve] = useState<{ key: string; curve: ConnectionCurve | null; error: string | null } | null>(null);
  const [bundle, setBundle] = useState<{ bundle: BundleView | null; error: string | null } | null>(null);
  const [colors, setColors] = useState<ChartColors>(() => readChartColors(document.documentElement));
  const desktop = info?.runtime === 'electron';
  const content = doc.history.present.content;
  const view = doc.history.present.view;
  const dirty = isDirty(doc);
  const [bundleRevision, setBundleRevision] = useState(0);
  const [fitActivity, setFitActivity] = useState<string | null>(null);
  const analysisState = useAnalysis(api, content.tripsText, content.settings, bundleRevision);
  const { analysis } = analysisState;
  // The export buttons act on the analysis on screen when clicked, not the one of the last render.
  const analysisRef = useRef(analysis);
  analysisRef.current = analysis;
  const exportable = Boolean(analysis && !analysis.scoringError && analysis.trips.length > 0);
  const docRef = useRef(doc);
  docRef.current = doc;

  const now = () => Date.now();
  const update = useCallback((fn: (d: DocumentModel) => DocumentModel) => setDoc((d) => fn(d)), []);

  // Start-up: who serves the API, what the last session left, the demo on a first start.
  useEffect(() => {
    let live = true;
    void (async () => {
      let appInfo: AppInfo;
      try {
        appInfo = await api.getAppInfo();
      } catch (err) {
        setNotice({ kind: 'error', text: `The engine did not answer: ${message(err)}` });
        return;
      }
      if (!live) return;
      setInfo(appInfo);
      const left = appInfo.runtime === 'electron' ? await api.takeRecovery().catch(() => null) : readPageAutosave();
      if (left) setRecovery({ savedAt: left.savedAt, content: left.content });
      else if (isFirstStart()) {
        // The demo counts as saved: closing it unchanged asks nothing.
        setDoc(openDocument(DEMO_WORKSPACE, null));
        setTab('trips');
      }
    })();
    return () => {
      live = false;
    };
  }, [api]);

  // The bundle in use, again whenever the user switches it.
  useEffect(() => {
    api.getBundleInfo().then(setBundle, (err: unknown) => setBundle({ bundle: null, error: message(err) }));
  }, [api, bundleRevision]);

  const bundleChanged = useCallback((text: string) => {
    setBundleRevision((r) => r + 1);
    setNotice({ kind: 'info', text });
  }, []);

  // Theme: the page's own colours, and in the desktop app the native ones too.
  useEffect(() => {
    applyTheme(content.theme);
    setColors(readChartColors(document.documentElement));
    if (desktop) api.setTheme(content.theme).catch(() => undefined);
    const media = matchMedia('(prefers-color-scheme: dark)');
    const onChange = () => {
      applyTheme(content.theme);
      setColors(readChartColors(document.documentElement));
    };
    media.addEventListener('change', onChange);
    return () => media.removeEventListener('change', onChange);
  }, [api, content.theme, desktop]);

  // Unsaved changes: tell the main process (for its close prompt), or guard the page's unload.
  useEffect(() => {
    document.title = `${doc.fileName ?? 'Untitled workspace'}${dirty ? ' •' : ''} — Layline`;
    if (desktop) {
      api.setDocumentState({ dirty }).catch(() => undefined);
      return undefined;
    }
    if (!dirty) return undefined;
    const guard = (e: BeforeUnloadEvent) => e.preventDefault();
    addEventListener('beforeunload', guard);
    return () => removeEventListener('beforeunload', guard);
  }, [api, desktop, dirty, doc.fileName]);

  // Autosave a little after the last edit, for recovery after a crash.
  useEffect(() => {
    if (!info || !dirty) return undefined;
    const timer = setTimeout(() => {
      if (desktop) api.autosaveWorkspace(content).catch((err: unknown) => setNotice({ kind: 'error', text: `Autosave failed: ${message(err)}` }));
      else writePageAutosave(content);
    }, AUTOSAVE_DELAY_MS);
    return () => clearTimeout(timer);
  }, [api, info, desktop, dirty, content]);

  // The selected connection's curves, fetched again whenever a new analysis arrives.
  const curveKey = analysis && selection ? `${analysis.analysisId}/${selection.tripId}/${selection.connectionIndex}` : null;
  useEffect(() => {
    if (!analysis || !selection || !curveKey) return;
    const trip = analysis.trips.find((t) => t.id === selection.tripId);
    if (!trip?.connections[selection.connectionIndex] || trip.connections[selection.connectionIndex]?.pMake === null) return;
    let live = true;
    api.connectionCurve(analysis.analysisId, selection.tripId, selection.connectionIndex).then(
      (c) => live && setCurve({ key: curveKey, curve: c, error: null }),
      (err: unknown) => live && setCurve({ key: curveKey, curve: null, error: `The charts could not be drawn: ${message(err)}` }),
    );
    return () => {
      live = false;
    };
  }, [api, analysis, selection, curveKey]);

  const setText = (text: string, immediate: boolean) => {
    if (immediate) analysisState.skipNextDebounce();
    update((d) => editTripsText(d, text, now(), !immediate));
  };
  const setSettings = (patch: Partial<AnalysisSettings>, key: string | null) => update((d) => editSettings(d, patch, now(), key));
  const setView = (patch: Partial<TableView>, key: string | null) => update((d) => editView(d, patch, now(), key));
  const setFilter = (patch: Partial<TripFilter>, key: string | null) => setView({ filter: { ...view.filter, ...patch } }, key);

  const replaceDocument = (next: DocumentModel, text: string) => {
    analysisState.skipNextDebounce();
    setDoc(next);
    setSelection(null);
    setNotice({ kind: 'info', text });
  };

  const loadDemo = () => {
    analysisState.skipNextDebounce();
    update((d) => editContent(d, { tripsText: DEMO_WORKSPACE.tripsText }, now()));
    setNotice({ kind: 'info', text: `Loaded the demo: ${DEMO_ORGANISATION}, ${DEMO_SCENARIO}. All people and bookings are invented. Undo brings back what was there.` });
  };

  const importText = (name: string, text: string) => {
    analysisState.skipNextDebounce();
    update((d) => editTripsText(d, text, now(), false));
    setTab('intake');
    setNotice({ kind: 'info', text: `Imported ${name}. It replaced the trips text; Undo brings back what was there.` });
  };

  const importFile = async () => {
    try {
      if (desktop) {
        const r = await api.importTripsFile();
        if (r.status === 'imported') importText(r.name, r.text);
        else if (r.status === 'failed') setNotice({ kind: 'error', text: r.message });
        return;
      }
      const file = await pickFile(TRIP_FILE_TYPES);
      if (file) importText(file.name, await readTextFile(file));
    } catch (err) {
      setNotice({ kind: 'error', text: message(err) });
    }
  };

  const dropFile = (file: File) => {
    readTextFile(file).then(
      (text) => importText(file.name, text),
      (err: unknown) => setNotice({ kind: 'error', text: message(err) }),
    );
  };

  const save = async (saveAs: boolean) => {
    const current = docRef.current;
    if (!desktop) {
      downloadWorkspace(current.history.present.content, current.fileName ?? 'workspace');
      clearPageAutosave();
      setDoc(markSaved(current, current.fileName ?? 'workspace.layline'));
      setNotice({ kind: 'info', text: 'The workspace was downloaded by the browser.' });
      return;
    }
    const r = await api.saveWorkspace(current.history.present.content, saveAs).catch((err: unknown) => ({ status: 'failed' as const, filePath: '', message: message(err) }));
    if (r.status === 'saved') {
      setDoc((d) => markSaved(d, r.filePath.split(/[\\/]/).pop() ?? r.filePath));
      setNotice({ kind: 'info', text: `Saved ${r.filePath} (the previous copy is kept as .bak).` });
    } else if (r.status === 'failed') setNotice({ kind: 'error', text: r.message });
  };

  const exportReport = async (kind: ReportExportKind) => {
    const current = analysisRef.current;
    if (!current || current.scoringError) return;
    try {
      const file = await api.exportReport(current.analysisId, kind);
      downloadText(file.text, file.mimeType, file.fileName);
      setNotice({ kind: 'info', text: `${file.fileName} was handed to the browser's download. Its figures are estimates from historical data, not guarantees.` });
    } catch (err) {
      setNotice({ kind: 'error', text: `Could not export: ${message(err)}` });
    }
  };

  const [paper, setPaper] = useState<'A4' | 'Letter'>('A4');
  const exportPdf = async (kind: 'manager' | 'briefings') => {
    const current = analysisRef.current;
    if (!current || current.scoringError) return;
    const r = await api.exportReportPdf(current.analysisId, kind, paper).catch((err: unknown) => ({ status: 'failed' as const, message: message(err) }));
    if (r.status === 'saved') setNotice({ kind: 'info', text: `Saved ${r.filePath}. Its figures are estimates from historical data, not guarantees.` });
    else if (r.status === 'failed') setNotice({ kind: 'error', text: r.message });
  };

  const confirmDiscard = () => !isDirty(docRef.current) || confirm('The workspace has unsaved changes. Discard them?');

  const open = async (path: string | null = null) => {
    if (!confirmDiscard()) return;
    try {
      if (!desktop) {
        const file = await pickFile('.layline,application/json');
        if (!file) return;
        const opened = await readWorkspaceUpload(file);
        replaceDocument(openDocument(opened, file.name), `Opened ${file.name}.`);
        return;
      }
      const r = await api.openWorkspace(path);
      if (r.status === 'opened') replaceDocument(openDocument(r.content, r.filePath.split(/[\\/]/).pop() ?? r.filePath), `Opened ${r.filePath}.`);
      else if (r.status === 'failed') setNotice({ kind: 'error', text: r.message });
    } catch (err) {
      setNotice({ kind: 'error', text: `Could not open the workspace: ${message(err)} The file was left as it is.` });
    }
  };

  const newWorkspace = () => {
    if (!confirmDiscard()) return;
    if (desktop) api.newWorkspace().catch(() => undefined);
    replaceDocument(openDocument(EMPTY_WORKSPACE, null), 'Started a new workspace.');
    setTab('intake');
  };

  const runCommand = (command: MenuCommand) => {
    if (command === 'undo') update((d) => ({ ...d, history: undo(d.history) }));
    else if (command === 'redo') update((d) => ({ ...d, history: redo(d.history) }));
    else if (command === 'save') void save(false);
    else if (command === 'save-as') void save(true);
    else if (command === 'open') void open();
    else if (command === 'new') newWorkspace();
    else if (command === 'import') void importFile();
    else if (command === 'load-demo') loadDemo();
    else if (command === 'show-settings') setTab('settings');
    else if (command === 'find') {
      setTab('trips');
      setTimeout(() => document.querySelector<HTMLInputElement>('.toolbar input[type=search]')?.focus(), 0);
    }
  };
  const commandRef = useRef(runCommand);
  commandRef.current = runCommand;
  const openRef = useRef(open);
  openRef.current = open;

  // Keyboard shortcuts (the desktop menu shows the same accelerators without registering them).
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const mod = e.ctrlKey || e.metaKey;
      if (!mod || e.altKey) return;
      const k = e.key.toLowerCase();
      const command: MenuCommand | null = k === 'z' ? (e.shiftKey ? 'redo' : 'undo') : k === 'y' ? 'redo' : k === 's' ? (e.shiftKey ? 'save-as' : 'save') : k === 'o' ? 'open' : k === 'f' ? 'find' : null;
      if (!command) return;
      e.preventDefault();
      commandRef.current(command);
    };
    addEventListener('keydown', onKey);
    return () => removeEventListener('keydown', onKey);
  }, []);

  // Events from the main process: menu choices, files opened from the OS, theme changes.
  useEffect(() => {
    if (!desktop) return undefined;
    let live = true;
    const loop = async () => {
      while (live) {
        let event: AppEvent;
        try {
          event = await api.nextAppEvent();
        } catch {
          await new Promise((r) => setTimeout(r, 1000));
          continue;
        }
        if (!live) return;
        if (event.kind === 'menu') commandRef.current(event.command);
        else if (event.kind === 'open-path') void openRef.current(event.path);
        else setColors(readChartColors(document.documentElement));
      }
    };
    void loop();
    return () => {
      live = false;
    };
    // The loop reads the current handlers through commandRef, so it starts once per API.
  }, [api, desktop]);

  const selectedTrip = analysis && selection ? analysis.trips.find((t) => t.id === selection.tripId) : undefined;
  const selectedConnection = selectedTrip?.connections.find((c) => c.index === selection?.connectionIndex);
  const optionCount = useMemo(() => (analysis ? optionGroups(analysis.trips).length : 0), [analysis]);
  // While a new analysis redraws the same connection's curves, the previous ones stay up.
  const sameConnection = (key: string) => selection !== null && key.endsWith(`/${selection.tripId}/${selection.connectionIndex}`);
  const shownCurve = curve && (curve.key === curveKey || (sameConnection(curve.key) && curve.curve !== null)) ? curve : null;

  return (
    <div class="shell">
      <header class="shell-header">
        <div class="brand">
          <h1>Layline</h1>
          <span class="doc-title" data-testid="doc-title">
            {doc.fileName ?? 'Untitled workspace'}
            {dirty && <span aria-label="unsaved changes"> •</span>}
          </span>
        </div>
        <div class="header-actions" role="toolbar" aria-label="Workspace">
          <button type="button" onClick={newWorkspace}>
            New
          </button>
          <button type="button" onClick={() => void open()}>
            Open…
          </button>
          <button type="button" onClick={() => void save(false)}>
            Save
          </button>
          <button type="button" onClick={() => void save(true)} disabled={!desktop} title={desktop ? '' : 'The page saves by downloading'}>
            Save as…
          </button>
          <button type="button" onClick={() => runCommand('undo')} disabled={!canUndo(doc.history)} aria-keyshortcuts="Control+Z">
            Undo
          </button>
          <button type="button" onClick={() => runCommand('redo')} disabled={!canRedo(doc.history)} aria-keyshortcuts="Control+Shift+Z">
            Redo
          </button>
          <TargetInput compact target={content.settings.targetProbability} onTarget={(t) => setSettings({ targetProbability: t }, 'target')} />
          <span role="group" aria-label="Export">
            <button type="button" onClick={() => void exportReport('manager')} disabled={!exportable}>
              Manager report
            </button>
            <button type="button" onClick={() => void exportReport('briefings')} disabled={!exportable}>
              Briefings
            </button>
            <button type="button" onClick={() => void exportReport('connections')} disabled={!exportable}>
              Connections CSV
            </button>
            {desktop && (
              <>
                <button type="button" onClick={() => void exportPdf('manager')} disabled={!exportable}>
                  Manager PDF
                </button>
                <button type="button" onClick={() => void exportPdf('briefings')} disabled={!exportable}>
                  Briefings PDF
                </button>
                <select aria-label="Paper size" value={paper} onChange={(e) => setPaper(e.currentTarget.value === 'Letter' ? 'Letter' : 'A4')}>
                  <option value="A4">A4</option>
                  <option value="Letter">US Letter</option>
                </select>
              </>
            )}
          </span>
          <span class="engine-state" role="status" aria-live="polite" data-testid="engine-state">
            {analysisState.busy ? 'Scoring…' : analysis ? `Scored in ${Math.round(analysis.parseMs + analysis.scoreMs)} ms` : ''}
            {fitActivity && (
              <button type="button" class="link-button" onClick={() => setTab('history')}>
                {fitActivity}
              </button>
            )}
          </span>
        </div>
      </header>
      {recovery && (
        <div class="banner" role="alert">
          Unsaved work from {new Date(recovery.savedAt).toLocaleString()} was found.{' '}
          <button
            type="button"
            onClick={() => {
              replaceDocument(openDocument(recovery.content, null, EMPTY_WORKSPACE), 'Recovered the unsaved work. Save it to keep it.');
              setRecovery(null);
            }}
          >
            Recover it
          </button>{' '}
          <button
            type="button"
            onClick={() => {
              setRecovery(null);
              if (desktop) api.discardRecovery().catch(() => undefined);
              else clearPageAutosave();
            }}
          >
            Discard it
          </button>
        </div>
      )}
      {notice && (
        <div class={`banner ${notice.kind}`} role={notice.kind === 'error' ? 'alert' : 'status'}>
          {notice.text}{' '}
          <button type="button" onClick={() => setNotice(null)} aria-label="Dismiss the message">
            Dismiss
          </button>
        </div>
      )}
      {analysis?.scoringError && (
        <div class="banner error" role="alert">
          {analysis.scoringError}
        </div>
      )}
      {analysisState.error && (
        <div class="banner error" role="alert">
          The engine failed: {analysisState.error}
        </div>
      )}
      <nav class="tabs" role="tablist" aria-label="Screens">
        {TABS.map((t) => (
          <button
            key={t.id}
            type="button"
            role="tab"
            id={`tab-${t.id}`}
            aria-selected={tab === t.id}
            aria-controls={`panel-${t.id}`}
            tabIndex={tab === t.id ? 0 : -1}
            onClick={() => setTab(t.id)}
            onKeyDown={(e) => {
              const i = TABS.findIndex((x) => x.id === tab);
              const next = e.key === 'ArrowRight' ? TABS[(i + 1) % TABS.length] : e.key === 'ArrowLeft' ? TABS[(i + TABS.length - 1) % TABS.length] : null;
              if (next) {
                setTab(next.id);
                document.getElementById(`tab-${next.id}`)?.focus();
              }
            }}
          >
            {t.label}
            {t.id === 'trips' && analysis ? ` (${analysis.trips.length})` : ''}
            {t.id === 'intake' && analysis && analysis.problems.length ? ` (${count(analysis.problems.length, 'problem')})` : ''}
            {t.id === 'options' && optionCount ? ` (${optionCount})` : ''}
          </button>
        ))}
      </nav>
      <main class="panel">
        {tab !== 'history' && (
        <div id={`panel-${tab}`} role="tabpanel" aria-labelledby={`tab-${tab}`}>
        {tab === 'intake' && <IntakeView text={content.tripsText} analysis={analysis} busy={analysisState.busy} onText={setText} onImport={() => void importFile()} onDropFile={dropFile} onLoadDemo={loadDemo} />}
        {tab === 'trips' &&
          (analysis ? (
            <TripsView
              analysis={analysis}
              filter={view.filter}
              sort={view.sort}
              target={content.settings.targetProbability}
              selection={selection}
              onFilter={setFilter}
              onSort={(sort) => setView({ sort }, null)}
              onSelect={setSelection}
              detail={
                selectedTrip && selectedConnection ? (
                  <ConnectionDetail
                    trip={selectedTrip}
                    connection={selectedConnection}
                    curve={shownCurve?.curve ?? null}
                    curveError={shownCurve?.error ?? null}
                    colors={colors}
                    target={content.settings.targetProbability}
                    intervalLevel={analysis.intervalLevel}
                    onClose={() => setSelection(null)}
                  />
                ) : null
              }
            />
          ) : (
            <p aria-busy="true">Reading the trips…</p>
          ))}
        {tab === 'options' && analysis && <OptionsView trips={analysis.trips} colors={colors} />}
        {tab === 'group' &&
          (analysis?.group ? (
            <GroupView
              group={analysis.group}
              colors={colors}
              onShowTraveler={(traveler) => {
                setFilter({ traveler }, null);
                setTab('trips');
              }}
            />
          ) : (
            <p>{analysis?.scoringError ?? 'No scored trips yet.'}</p>
          ))}
        {tab === 'settings' && (
          <SettingsView
            settings={content.settings}
            theme={content.theme}
            bundle={bundle?.bundle ?? null}
            bundleError={bundle?.error ?? null}
            onSettings={setSettings}
            onTheme={(theme) => update((d) => editContent(d, { theme }, now()))}
          />
        )}
        </div>
        )}
        {/* Always mounted, so a running fit keeps reporting while other screens are shown. */}
        <div id="panel-history" role="tabpanel" aria-labelledby="tab-history" hidden={tab !== 'history'}>
          {info && <HistoryView api={api} desktop={desktop} colors={colors} onBundleChanged={bundleChanged} onFitActivity={setFitActivity} />}
        </div>
      </main>
      <footer class="caution">
        {analysis?.caution || 'Estimates from historical delay data, not guarantees. Airline rules, minimum connecting times and local regulations decide.'}
        {info && (
          <span class="muted" data-testid="app-info">
            {' '}
            {info.name} {info.version}, engine running in the {info.runtime === 'web' ? 'page worker' : 'desktop app'}.
          </span>
        )}
      </footer>
    </div>
  );
}
