import AsyncStorage from '@react-native-async-storage/async-storage';
import { z } from 'zod';
import { signInResponseSchema } from '@/shared/protocol';

// Stored as the sign-in answer; versioned key so a future shape change starts clean.
export const sessionSchema = signInResponseSchema;
export type Session = z.infer<typeof sessionSchema>;

const key = 'fourpoint.session.v1';

export async function loadSession(): Promise<Session | null> {
  try {
    const raw = await AsyncStorage.getItem(key);
    if (!raw) return null;
    const parsed = sessionSchema.safeParse(JSON.parse(raw));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

export async function saveSession(session: Session): Promise<void> {
  await AsyncStorage.setItem(key, JSON.stringify(session));
}

export async function clearSession(): Promise<void> {
  await AsyncStorage.removeItem(key);
}
