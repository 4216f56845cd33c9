import AsyncStorage from '@react-native-async-storage/async-storage';
import { Platform } from 'react-native';
import { z } from 'zod';
// The auth schemas alone: the '@/shared/protocol' barrel would build every API schema before sign-in can paint.
import { signInResponseSchema } from '@/shared/protocol/auth';

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

/**
 * Keeps the session across reloads and offline starts. On the web, storage is localStorage, which any script
 * on the page can read: the refresh token never goes there (the server keeps it in an httpOnly cookie), only
 * the short-lived access token, which sign-out ends on the server.
 */
export async function saveSession(session: Session): Promise<void> {
  const { refreshToken, ...rest } = session;
  await AsyncStorage.setItem(key, JSON.stringify(Platform.OS === 'web' ? rest : { ...rest, refreshToken }));
}

export async function clearSession(): Promise<void> {
  await AsyncStorage.removeItem(key);
}
