import AsyncStorage from '@react-native-async-storage/async-storage';
import { z } from 'zod';
import { request } from '@/api/client';
import { hexToBytes } from '@/shared/seal';

const key = 'fourpoint.clinic-public-key.v1';

const keyText = z.string().regex(/^[0-9a-fA-F]{64}$|^[A-Za-z0-9+/_-]{43}=?$/);
const keyResponseSchema = z.object({ publicKey: keyText }).loose();

function bytesOf(text: string): Uint8Array {
  if (/^[0-9a-fA-F]{64}$/.test(text)) return hexToBytes(text);
  const normal = text.replace(/-/g, '+').replace(/_/g, '/');
  const binary = atob(normal.endsWith('=') ? normal : `${normal}=`);
  return Uint8Array.from(binary, (c) => c.charCodeAt(0));
}

/** The key cached on the device; sealing happens offline, so it must have been fetched once while online. */
export async function cachedClinicKey(): Promise<Uint8Array | null> {
  const text = await AsyncStorage.getItem(key).catch(() => null);
  if (!text || !keyText.safeParse(text).success) return null;
  return bytesOf(text);
}

/** Fetches the clinic's sealing key and caches it on the device; throws when the server could not say. */
export async function fetchClinicKey(): Promise<string> {
  const result = await request(
    { method: 'GET', url: '/clinic/public-key', timeout: 8_000 },
    keyResponseSchema,
  );
  if (result.kind !== 'ok') throw new Error(result.message);
  await AsyncStorage.setItem(key, result.data.publicKey);
  return result.data.publicKey;
}

/** Fetches and caches the clinic's sealing key; offline it keeps the cached one. */
export async function refreshClinicKey(): Promise<Uint8Array | null> {
  try {
    return bytesOf(await fetchClinicKey());
  } catch {
    return cachedClinicKey();
  }
}
