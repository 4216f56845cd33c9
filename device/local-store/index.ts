export * from './clients';
export * from './database';
export * from './finish-session';
export * from './outbox';
export * from './queries';
export * from './records';
export * from './sessions';
export { cachedClinicKey, fetchClinicKey, refreshClinicKey } from './clinic-key';
export { LocalSyncStorage, localSyncStorage } from './sync-storage';
