// Messages between the page and its engine worker (shared with the Electron worker thread).
export type { WorkerReply, WorkerRequest } from '../../shared/api/message-channel';
