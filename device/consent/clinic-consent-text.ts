// The clinic's current consent wording, fetched while online and kept on the device, so consent taken offline
// names a text the clinic server has published (and the server accepts the consent row when it syncs).
import AsyncStorage from '@react-native-async-storage/async-storage';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { consentTextListResponseSchema } from '@/shared/protocol/practice';
import {
  consentText as builtInParagraphs,
  consentTextVersion as builtInVersion,
} from '@/shared/consent/consent-text';
import { request } from '@/api/client';

const storageKey = 'fourpoint.clinic-consent-text';
/** Every version the clinic has published, by version number: a consent names the row of the version signed. */
const versionsKey = 'fourpoint.clinic-consent-text-versions';
const versionIdsSchema = z.record(z.string(), z.uuid());
export const clinicConsentTextKey = ['clinic-consent-text'] as const;

const cachedConsentTextSchema = z.object({
  id: z.uuid(),
  version: z.number(),
  title: z.string(),
  body: z.string(),
});
export type CachedConsentText = z.infer<typeof cachedConsentTextSchema>;

/** What the consent form shows and the session records: the clinic's text, or the built-in one before any fetch. */
export type ShownConsentText = { id: string | null; version: number; paragraphs: readonly string[] };

export async function readCachedConsentText(): Promise<CachedConsentText | null> {
  const raw = await AsyncStorage.getItem(storageKey);
  if (!raw) return null;
  const parsed = cachedConsentTextSchema.safeParse(JSON.parse(raw));
  return parsed.success ? parsed.data : null;
}

/** Asks the clinic server for its current text and keeps it; answers the kept copy when the server is out of reach. */
export async function refreshClinicConsentText(): Promise<CachedConsentText | null> {
  const result = await request({ method: 'get', url: '/consent-texts' }, consentTextListResponseSchema);
  if (result.kind === 'ok') {
    await AsyncStorage.setItem(
      versionsKey,
      JSON.stringify(Object.fromEntries(result.data.texts.map((t) => [String(t.version), t.id]))),
    );
    const current = result.data.texts.find((t) => t.isCurrent);
    if (current) {
      const kept: CachedConsentText = {
        id: current.id,
        version: current.version,
        title: current.title,
        body: current.body,
      };
      await AsyncStorage.setItem(storageKey, JSON.stringify(kept));
      return kept;
    }
  }
  return readCachedConsentText();
}

/**
 * The clinic's row id of each consent wording version this device has fetched, keyed by version. Before any
 * list was kept (an older install) it holds the one current text kept.
 */
export async function readConsentTextIds(): Promise<Record<string, string>> {
  const raw = await AsyncStorage.getItem(versionsKey);
  const parsed = raw ? versionIdsSchema.safeParse(JSON.parse(raw)) : null;
  if (parsed?.success) return parsed.data;
  const current = await readCachedConsentText();
  return current ? { [String(current.version)]: current.id } : {};
}

export function toShownConsentText(cached: CachedConsentText | null): ShownConsentText {
  if (!cached) return { id: null, version: builtInVersion, paragraphs: builtInParagraphs };
  const paragraphs = cached.body
    .split(/\n\s*\n/)
    .map((p) => p.trim())
    .filter(Boolean);
  return { id: cached.id, version: cached.version, paragraphs };
}

/** The consent text to show; refreshed from the clinic server whenever it can be reached. */
export function useClinicConsentText(): ShownConsentText {
  const query = useQuery({
    queryKey: clinicConsentTextKey,
    queryFn: refreshClinicConsentText,
    networkMode: 'always',
    staleTime: 10 * 60 * 1000,
  });
  return toShownConsentText(query.data ?? null);
}
