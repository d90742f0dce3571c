// The one contract between the renderer and the main process.
//
// Every request the renderer can make is declared here once: its channel name, a
// schema for its arguments and a schema for its result. The preload, the main-side
// handlers and the in-page browser implementation are all typed from this table and
// all validate against it at runtime, so a payload that slips past the types still fails.
import * as v from 'valibot';

export const AppInfoSchema = v.object({
  name: v.string(),
  version: v.string(),
  /** Where the renderer's API is served from: the Electron main process or the in-page worker. */
  runtime: v.picklist(['electron', 'web']),
  platform: v.string(),
});
export type AppInfo = v.InferOutput<typeof AppInfoSchema>;

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
