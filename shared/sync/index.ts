export { SyncEngine, type SyncEngineOptions, type SyncReport, type SyncStatus } from './engine';
export { backoffDelay, defaultBackoff, type BackoffPolicy } from './backoff';
export { MemorySyncStorage, isNewer, type LocalRow } from './memory-storage';
export { clipItem, mutationItem } from './outbox';
export type { OutboxItem, OutboxItemPatch, OutboxKind, OutboxState, SyncStorage } from './storage';
export { TransportError, type ClipUpload, type SyncTransport } from './transport';
export {
  SYNC_PATHS,
  createHttpTransport,
  toTransportError,
  type HttpTransportOptions,
} from './http-transport';
