export { DeviceSyncProvider } from './sync-provider';
export { useDeviceSync, type DeviceSyncState } from './sync-context';
export { deviceId } from './device-id';
