// Messages between the page and its engine worker.
export interface WorkerRequest {
  readonly id: number;
  readonly channel: string;
  readonly args: unknown[];
}

export type WorkerReply = { readonly id: number; readonly ok: true; readonly value: unknown } | { readonly id: number; readonly ok: false; readonly error: string };
