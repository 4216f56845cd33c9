import AsyncStorage from '@react-native-async-storage/async-storage';
import { v4 as uuid } from 'uuid';

const key = 'fourpoint.device-id.v1';
const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** This device's id for the sync protocol: made once, kept with the device (not the signed-in user). */
export async function deviceId(): Promise<string> {
  const stored = await AsyncStorage.getItem(key).catch(() => null);
  if (stored && uuidPattern.test(stored)) return stored;
  const made = uuid();
  await AsyncStorage.setItem(key, made);
  return made;
}
