// The Layline workspace file: a versioned JSON document holding the trips text, the
// analysis settings, the chosen bundle and the theme.
//
// Reading never guesses: anything that is not a workspace this version understands is
// returned as a WorkspaceReadError naming what is wrong, so the caller can refuse to
// overwrite it.
import * as v from 'valibot';
import { AnalysisSettingsSchema, DEFAULT_ANALYSIS_SETTINGS, THEMES } from './settings';

export const WORKSPACE_FORMAT = 'layline-workspace';
export const WORKSPACE_VERSION = 1;
export const WORKSPACE_EXTENSION = 'layline';
/** A pasted trips text above this size is refused rather than saved (about 50,000 legs). */
export const MAX_TRIPS_TEXT_CHARS = 5_000_000;

export const WorkspaceContentSchema = v.strictObject({
  /** What the user typed, pasted or imported, kept verbatim so nothing is lost. */
  tripsText: v.pipe(v.string(), v.maxLength(MAX_TRIPS_TEXT_CHARS)),
  settings: AnalysisSettingsSchema,
  /** The posterior bundle's id, or null for the bundled default. */
  bundleId: v.nullable(v.pipe(v.string(), v.maxLength(200))),
  theme: v.picklist(THEMES),
});
export type WorkspaceContent = v.InferOutput<typeof WorkspaceContentSchema>;

const WorkspaceFileSchema = v.strictObject({
  format: v.literal(WORKSPACE_FORMAT),
  version: v.literal(WORKSPACE_VERSION),
  savedAt: v.pipe(v.string(), v.isoTimestamp()),
  content: WorkspaceContentSchema,
});

export const EMPTY_WORKSPACE: WorkspaceContent = Object.freeze({
  tripsText: '',
  settings: DEFAULT_ANALYSIS_SETTINGS,
  bundleId: null,
  theme: 'system',
});

export type WorkspaceReadErrorKind = 'empty' | 'not-json' | 'not-a-workspace' | 'newer-version' | 'invalid';

export class WorkspaceReadError extends Error {
  constructor(
    readonly kind: WorkspaceReadErrorKind,
    message: string,
  ) {
    super(message);
    this.name = 'WorkspaceReadError';
  }
}

/** Serialises a workspace; `savedAt` is passed in so the function stays pure. */
export function serializeWorkspace(content: WorkspaceContent, savedAt: Date): string {
  const checked = v.parse(WorkspaceContentSchema, content);
  return JSON.stringify({ format: WORKSPACE_FORMAT, version: WORKSPACE_VERSION, savedAt: savedAt.toISOString(), content: checked }, null, 2) + '\n';
}

export interface ReadWorkspace {
  readonly content: WorkspaceContent;
  readonly savedAt: string;
}

/** Parses a workspace file's text, or throws a WorkspaceReadError saying plainly what is wrong. */
export function parseWorkspace(text: string): ReadWorkspace {
  if (text.trim() === '') throw new WorkspaceReadError('empty', 'The file is empty; it is not a Layline workspace.');
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    const detail = err instanceof Error ? err.message : String(err);
    throw new WorkspaceReadError('not-json', `The file is damaged or is not a Layline workspace: it is not valid JSON (${detail}).`);
  }
  if (typeof raw !== 'object' || raw === null || (raw as { format?: unknown }).format !== WORKSPACE_FORMAT) {
    throw new WorkspaceReadError('not-a-workspace', 'The file is JSON but not a Layline workspace (its "format" is not "layline-workspace").');
  }
  const version = (raw as { version?: unknown }).version;
  if (typeof version === 'number' && version > WORKSPACE_VERSION) {
    throw new WorkspaceReadError('newer-version', `The workspace was saved by a newer Layline (format version ${version}); this copy reads version ${WORKSPACE_VERSION}. Update Layline to open it.`);
  }
  const parsed = v.safeParse(WorkspaceFileSchema, raw);
  if (!parsed.success) {
    const issue = parsed.issues[0];
    const where = issue?.path?.map((p) => String(p.key)).join('.') ?? '';
    throw new WorkspaceReadError('invalid', `The workspace file is damaged: ${where ? `${where}: ` : ''}${issue?.message ?? 'invalid content'}.`);
  }
  return { content: parsed.output.content, savedAt: parsed.output.savedAt };
}

/** True when two workspace contents would save to the same file (ignoring savedAt). */
export function sameContent(a: WorkspaceContent, b: WorkspaceContent): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}
