// File handling for the plain page, where there is no main process: downloads for saving,
// a file picker for opening and importing, and localStorage for autosave and recovery.
import { parseWorkspace, serializeWorkspace, WORKSPACE_EXTENSION, WorkspaceContentSchema, type WorkspaceContent } from '../../shared/workspace/format';
import * as v from 'valibot';

const AUTOSAVE_KEY = 'layline.autosave.v1';
const STARTED_KEY = 'layline.started';

export function downloadWorkspace(content: WorkspaceContent, fileName: string): void {
  const name = fileName.endsWith(`.${WORKSPACE_EXTENSION}`) ? fileName : `${fileName}.${WORKSPACE_EXTENSION}`;
  downloadText(serializeWorkspace(content, new Date()), 'application/json', name);
}

/** Hands a text file to the browser's download (in Electron, its save dialog). */
export function downloadText(text: string, mimeType: string, fileName: string): void {
  const blob = new Blob([text], { type: `${mimeType};charset=utf-8` });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** Lets the user pick one file; resolves null when they cancel. */
export function pickFile(accept: string): Promise<File | null> {
  return new Promise((resolve) => {
    const input = document.createElement('input');
    input.type = 'file';
    input.accept = accept;
    input.addEventListener('change', () => resolve(input.files?.[0] ?? null), { once: true });
    input.addEventListener('cancel', () => resolve(null), { once: true });
    input.click();
  });
}

export const TRIP_FILE_TYPES = '.csv,.tsv,.txt,.ics,text/csv,text/tab-separated-values,text/plain,text/calendar';
export const MAX_IMPORT_BYTES = 5_000_000;

export async function readTextFile(file: File): Promise<string> {
  if (file.size > MAX_IMPORT_BYTES) throw new Error(`${file.name} is ${Math.round(file.size / 1e6)} MB; Layline reads trip files up to 5 MB.`);
  return file.text();
}

export async function readWorkspaceUpload(file: File): Promise<WorkspaceContent> {
  return parseWorkspace(await readTextFile(file)).content;
}

export function writePageAutosave(content: WorkspaceContent): void {
  try {
    localStorage.setItem(AUTOSAVE_KEY, JSON.stringify({ savedAt: new Date().toISOString(), content }));
  } catch {
    // Storage full or disabled: autosave is a safety net, the document itself is unaffected.
  }
}

export function readPageAutosave(): { savedAt: string; content: WorkspaceContent } | null {
  try {
    const raw: unknown = JSON.parse(localStorage.getItem(AUTOSAVE_KEY) ?? 'null');
    const parsed = v.safeParse(v.object({ savedAt: v.string(), content: WorkspaceContentSchema }), raw);
    return parsed.success ? parsed.output : null;
  } catch {
    return null;
  }
}

export function clearPageAutosave(): void {
  localStorage.removeItem(AUTOSAVE_KEY);
}

/** True on the page's first start in this browser profile (then the demo opens). */
export function isFirstStart(): boolean {
  const first = localStorage.getItem(STARTED_KEY) === null;
  localStorage.setItem(STARTED_KEY, '1');
  return first;
}
