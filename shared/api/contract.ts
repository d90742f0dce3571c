// The one contract between the renderer and the main process.
//
// Every request the renderer can make is declared here once: its channel name, a
// schema for its arguments and a schema for its result. The preload, the main-side
// handlers and the in-page browser implementation are all typed from this table and
// all validate against it at runtime, so a payload that slips past the types still fails.
import * as v from 'valibot';
import { AnalysisSettingsSchema, THEMES } from '../workspace/settings';
import { WorkspaceContentSchema } from '../workspace/format';
import { AnalysisSchema, BundleViewSchema, ConnectionCurveSchema } from './analysis-schema';
import { HISTORY_REQUESTS } from '../history/history-requests';

export const AppInfoSchema = v.object({
  name: v.string(),
  version: v.string(),
  /** Where the renderer's API is served from: the Electron main process or the in-page worker. */
  runtime: v.picklist(['electron', 'web']),
  platform: v.string(),
});
export type AppInfo = v.InferOutput<typeof AppInfoSchema>;

/** The pasted or imported trips text, bounded so a runaway paste cannot stall the engine. */
const TripsText = v.pipe(v.string(), v.maxLength(5_000_000));
const Id = v.pipe(v.string(), v.minLength(1), v.maxLength(400));
const FilePath = v.pipe(v.string(), v.minLength(1), v.maxLength(4096));

export const MENU_COMMANDS = ['new', 'open', 'save', 'save-as', 'import', 'undo', 'redo', 'load-demo', 'show-settings', 'find'] as const;
export type MenuCommand = (typeof MENU_COMMANDS)[number];

/** Something the main process tells the page: a menu choice, a file to open, a theme switch. */
export const AppEventSchema = v.variant('kind', [
  v.strictObject({ kind: v.literal('menu'), command: v.picklist(MENU_COMMANDS) }),
  v.strictObject({ kind: v.literal('open-path'), path: FilePath }),
  v.strictObject({ kind: v.literal('theme'), dark: v.boolean() }),
]);
export type AppEvent = v.InferOutput<typeof AppEventSchema>;

/** Whether the page holds edits that are not saved, for the prompt on close. */
export const DocumentStateSchema = v.strictObject({
  dirty: v.boolean(),
});
export type DocumentState = v.InferOutput<typeof DocumentStateSchema>;

export const OpenedWorkspaceSchema = v.variant('status', [
  v.object({ status: v.literal('opened'), filePath: v.string(), savedAt: v.string(), content: WorkspaceContentSchema }),
  v.object({ status: v.literal('cancelled') }),
  /** The file could not be used; `message` says why and that the file was left as it is. */
  v.object({ status: v.literal('failed'), filePath: v.string(), message: v.string() }),
]);
export type OpenedWorkspace = v.InferOutput<typeof OpenedWorkspaceSchema>;

export const SavedWorkspaceSchema = v.variant('status', [
  v.object({ status: v.literal('saved'), filePath: v.string() }),
  v.object({ status: v.literal('cancelled') }),
  v.object({ status: v.literal('failed'), filePath: v.string(), message: v.string() }),
]);
export type SavedWorkspace = v.InferOutput<typeof SavedWorkspaceSchema>;

export const ImportedFileSchema = v.variant('status', [
  v.object({ status: v.literal('imported'), name: v.string(), text: v.string() }),
  v.object({ status: v.literal('cancelled') }),
  v.object({ status: v.literal('failed'), message: v.string() }),
]);

export const RecoveryOfferSchema = v.nullable(
  v.object({ savedAt: v.string(), sourcePath: v.nullable(v.string()), content: WorkspaceContentSchema }),
);
export type RecoveryOffer = v.InferOutput<typeof RecoveryOfferSchema>;

/** What the page can export from an analysis. */
export const REPORT_EXPORT_KINDS = ['manager', 'briefings', 'connections'] as const;
export type ReportExportKind = (typeof REPORT_EXPORT_KINDS)[number];

export const ReportExportSchema = v.object({ title: v.string(), fileName: v.string(), mimeType: v.picklist(['text/html', 'text/csv']), text: v.string() });
export type ReportExport = v.InferOutput<typeof ReportExportSchema>;

/** Paper sizes the desktop app prints reports on. */
export const PAPER_SIZES = ['A4', 'Letter'] as const;

export const ExportedPdfSchema = v.variant('status', [
  v.object({ status: v.literal('saved'), filePath: v.string() }),
  v.object({ status: v.literal('cancelled') }),
  /** Nothing was written; `message` says why. */
  v.object({ status: v.literal('failed'), message: v.string() }),
]);
export type ExportedPdf = v.InferOutput<typeof ExportedPdfSchema>;

/** A delay-history file the desktop app's dialog chose; its path may then be read by the engine. */
export const ChosenHistoryFileSchema = v.variant('status', [
  v.object({ status: v.literal('chosen'), path: v.string(), name: v.string(), bytes: v.number() }),
  v.object({ status: v.literal('cancelled') }),
]);

/**
 * One request: a strict tuple schema for its arguments and a schema for what it resolves to.
 *
 * Use v.strictTuple and v.strictObject for arguments, so extra or unknown fields are rejected
 * rather than silently dropped.
 */
export interface RequestSpec<A extends v.GenericSchema, R extends v.GenericSchema> {
  readonly args: A;
  readonly result: R;
}

function request<A extends v.GenericSchema, R extends v.GenericSchema>(args: A, result: R): RequestSpec<A, R> {
  return { args, result };
}

export const apiContract = {
  getAppInfo: request(v.strictTuple([]), AppInfoSchema),

  // The engine: runs off the UI thread (a Web Worker in the page, a worker thread in Electron).
  /** Parse and score a trips text under the given settings. */
  analyzeTrips: request(v.strictTuple([TripsText, AnalysisSettingsSchema]), AnalysisSchema),
  /** P(make) against layover and the margin distribution for one connection of an earlier analysis. */
  connectionCurve: request(v.strictTuple([Id, Id, v.pipe(v.number(), v.integer(), v.minValue(0), v.maxValue(100))]), ConnectionCurveSchema),
  /**
   * A report of an earlier analysis as a finished file's text: the manager report or the
   * travellers' briefings as standalone HTML, or the connections CSV (shared/report).
   */
  exportReport: request(v.strictTuple([Id, v.picklist(REPORT_EXPORT_KINDS)]), ReportExportSchema),
  /** The posterior bundle in use and its provenance, or a message saying why none is available. */
  getBundleInfo: request(v.strictTuple([]), v.object({ bundle: v.nullable(BundleViewSchema), error: v.nullable(v.string()) })),
  /**
   * Delay history (shared/history/history-requests.ts): preview a file's columns, fit it as a
   * background job (status with progress, ETA and the objective trace; cancel), save the fitted
   * bundle, list the bundles and choose the one the engine scores with.
   */
  ...HISTORY_REQUESTS,

  // Files and the desktop shell (Electron only; the page uses the browser's own file handling).
  /**
   * Print the manager report or the briefings of an earlier analysis to PDF with Electron's
   * printToPDF, after asking where to save it (desktop only; the page exports HTML).
   */
  exportReportPdf: request(v.strictTuple([Id, v.picklist(['manager', 'briefings']), v.picklist(PAPER_SIZES)]), ExportedPdfSchema),
  /** Open a workspace: null asks with the native dialog; a path must be one of the recent documents. */
  openWorkspace: request(v.strictTuple([v.nullable(FilePath)]), OpenedWorkspaceSchema),
  /**
   * Save to the current file, or ask where when there is none or `saveAs` is true. The main
   * process keeps the path itself, so the page cannot direct a write to an arbitrary file.
   */
  saveWorkspace: request(v.strictTuple([WorkspaceContentSchema, v.boolean()]), SavedWorkspaceSchema),
  /** Forget the current file (File › New); the next save asks where. */
  newWorkspace: request(v.strictTuple([]), v.null()),
  importTripsFile: request(v.strictTuple([]), ImportedFileSchema),
  /** Ask for a delay-history file (CSV or Parquet) with the native dialog; the path is then readable by previewHistory and startHistoryFit. */
  chooseHistoryFile: request(v.strictTuple([]), ChosenHistoryFileSchema),
  autosaveWorkspace: request(v.strictTuple([WorkspaceContentSchema]), v.null()),
  takeRecovery: request(v.strictTuple([]), RecoveryOfferSchema),
  discardRecovery: request(v.strictTuple([]), v.null()),
  recentWorkspaces: request(v.strictTuple([]), v.array(v.string())),
  setDocumentState: request(v.strictTuple([DocumentStateSchema]), v.null()),
  setTheme: request(v.strictTuple([v.picklist(THEMES)]), v.object({ dark: v.boolean() })),
  /** Resolves with the next event from the main process (long poll); the page asks again after each. */
  nextAppEvent: request(v.strictTuple([]), AppEventSchema),
  openExternal: request(v.strictTuple([v.pipe(v.string(), v.maxLength(2048))]), v.boolean()),
} as const;

export type ApiContract = typeof apiContract;
export type RequestName = keyof ApiContract;
export type RequestArgs<K extends RequestName> = v.InferOutput<ApiContract[K]['args']>;
export type RequestResult<K extends RequestName> = v.InferOutput<ApiContract[K]['result']>;

/** What the renderer sees: the preload's object in Electron, the in-page object on a plain page. */
export type LaylineApi = {
  readonly [K in RequestName]: (...args: RequestArgs<K>) => Promise<RequestResult<K>>;
};

/** What the main side implements: the same functions, before validation and transport. */
export type ApiHandlers = LaylineApi;

/** The name under which the preload exposes the API on `window`. */
export const API_GLOBAL_NAME = 'layline';

export const CHANNEL_PREFIX = 'layline:';

export function channelFor(name: RequestName): string {
  return CHANNEL_PREFIX + name;
}

export function requestNames(): RequestName[] {
  return Object.keys(apiContract) as RequestName[];
}

export class ContractError extends Error {
  constructor(
    readonly request: string,
    readonly part: 'args' | 'result' | 'sender' | 'unknown-request',
    detail: string,
  ) {
    super(`Layline API ${request}: ${part} rejected: ${detail}`);
    this.name = 'ContractError';
  }
}

function describeIssues(issues: readonly v.BaseIssue<unknown>[]): string {
  return issues
    .map((issue) => {
      const path = issue.path?.map((p) => String(p.key)).join('.') ?? '';
      return path ? `${path}: ${issue.message}` : issue.message;
    })
    .join('; ');
}

/** Parse the arguments of a request, throwing a ContractError that names what was wrong. */
export function parseArgs<K extends RequestName>(name: K, args: unknown): RequestArgs<K> {
  const spec = apiContract[name];
  if (!spec) throw new ContractError(String(name), 'unknown-request', 'no such request');
  const parsed = v.safeParse(spec.args, args);
  if (!parsed.success) throw new ContractError(name, 'args', describeIssues(parsed.issues));
  return parsed.output as RequestArgs<K>;
}

/** Parse the result of a request, so the renderer never trusts an unchecked reply. */
export function parseResult<K extends RequestName>(name: K, result: unknown): RequestResult<K> {
  const parsed = v.safeParse(apiContract[name].result, result);
  if (!parsed.success) throw new ContractError(name, 'result', describeIssues(parsed.issues));
  return parsed.output as RequestResult<K>;
}

export function isRequestName(name: string): name is RequestName {
  return Object.prototype.hasOwnProperty.call(apiContract, name);
}
