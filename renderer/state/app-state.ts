// What the page holds and how it changes: the workspace content plus the table's view,
// under one undo history. Pure functions; the App component only wires them to events.
import type { WorkspaceContent } from '../../shared/workspace/format';
import { sameContent } from '../../shared/workspace/format';
import type { AnalysisSettings } from '../../shared/workspace/settings';
import { commit, createHistory, type History } from './history';
import { NO_FILTER, type SortKey, type TripFilter } from './trip-table';

export interface TableView {
  readonly filter: TripFilter;
  readonly sort: SortKey;
}

/** One undoable state: the workspace's content and how the trips table is filtered and sorted. */
export interface Undoable {
  readonly content: WorkspaceContent;
  readonly view: TableView;
}

export const DEFAULT_VIEW: TableView = { filter: NO_FILTER, sort: 'risk' };

export interface DocumentModel {
  readonly history: History<Undoable>;
  /** The content as last saved or opened, to tell whether there are unsaved changes. */
  readonly savedContent: WorkspaceContent;
  /** The workspace file's name for the title bar, or null for an unsaved workspace. */
  readonly fileName: string | null;
}

export function openDocument(content: WorkspaceContent, fileName: string | null, saved: WorkspaceContent = content): DocumentModel {
  return { history: createHistory({ content, view: DEFAULT_VIEW }), savedContent: saved, fileName };
}

export function isDirty(doc: DocumentModel): boolean {
  return !sameContent(doc.history.present.content, doc.savedContent);
}

/** A typed edit (coalesced with the typing around it) or, with `typed` false, a paste, drop or import (its own undo step). */
export function editTripsText(doc: DocumentModel, tripsText: string, nowMs: number, typed = true): DocumentModel {
  const present = doc.history.present;
  if (present.content.tripsText === tripsText) return doc;
  return { ...doc, history: commit(doc.history, { ...present, content: { ...present.content, tripsText } }, nowMs, typed ? 'typing' : null) };
}

export function editSettings(doc: DocumentModel, patch: Partial<AnalysisSettings>, nowMs: number, coalesceKey: string | null = null): DocumentModel {
  const present = doc.history.present;
  const settings = { ...present.content.settings, ...patch };
  if (JSON.stringify(settings) === JSON.stringify(present.content.settings)) return doc;
  return { ...doc, history: commit(doc.history, { ...present, content: { ...present.content, settings } }, nowMs, coalesceKey) };
}

export function editContent(doc: DocumentModel, patch: Partial<WorkspaceContent>, nowMs: number): DocumentModel {
  const present = doc.history.present;
  return { ...doc, history: commit(doc.history, { ...present, content: { ...present.content, ...patch } }, nowMs) };
}

export function editView(doc: DocumentModel, patch: Partial<TableView>, nowMs: number, coalesceKey: string | null = null): DocumentModel {
  const present = doc.history.present;
  const view = { ...present.view, ...patch, filter: { ...present.view.filter, ...patch.filter } };
  if (JSON.stringify(view) === JSON.stringify(present.view)) return doc;
  return { ...doc, history: commit(doc.history, { ...present, view }, nowMs, coalesceKey) };
}

export function markSaved(doc: DocumentModel, fileName: string | null): DocumentModel {
  return { ...doc, savedContent: doc.history.present.content, fileName };
}
