import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  addClient,
  currentConsent,
  getClient,
  listClients,
  recordConsent,
  type NewClient,
  type NewConsent,
} from './clients';
import { fetchClinicKey } from './clinic-key';
import { finishSession } from './finish-session';
import { listOutbox, pendingOutboxCount, unsentSummary } from './outbox';
import { discardSession, getSession, listRecordings, listSessionsForClient, startSession } from './sessions';

export const localKeys = {
  root: ['local'] as const,
  clients: (search: string, consentTextVersion: string) =>
    ['local', 'clients', search, consentTextVersion] as const,
  client: (id: string) => ['local', 'client', id] as const,
  consent: (clientId: string, version: string) => ['local', 'consent', clientId, version] as const,
  sessionsOf: (clientId: string) => ['local', 'sessions-of', clientId] as const,
  session: (id: string) => ['local', 'session', id] as const,
  outbox: ['local', 'outbox'] as const,
  outboxCount: ['local', 'outbox-count'] as const,
  unsent: ['local', 'unsent'] as const,
};

// Local reads are cheap and offline; never treat them as stale network data or retry them.
const localQuery = { networkMode: 'always', retry: false, staleTime: 0 } as const;

/** Every client kept on the phone, with consent on file for the wording in force and whether any item waits. */
export function useLocalClients(search: string, consentTextVersion: string) {
  return useQuery({
    ...localQuery,
    queryKey: localKeys.clients(search, consentTextVersion),
    queryFn: () => listClients(search, consentTextVersion),
    placeholderData: keepPreviousData,
  });
}

export function useLocalClient(id: string) {
  return useQuery({ ...localQuery, queryKey: localKeys.client(id), queryFn: () => getClient(id) });
}

export function useCurrentConsent(clientId: string, textVersion: string) {
  return useQuery({
    ...localQuery,
    queryKey: localKeys.consent(clientId, textVersion),
    queryFn: () => currentConsent(clientId, textVersion),
  });
}

export function useClientSessions(clientId: string) {
  return useQuery({
    ...localQuery,
    queryKey: localKeys.sessionsOf(clientId),
    queryFn: () => listSessionsForClient(clientId),
  });
}

export function useLocalSession(id: string) {
  return useQuery({
    ...localQuery,
    queryKey: localKeys.session(id),
    queryFn: async () => {
      const session = await getSession(id);
      return session ? { session, recordings: await listRecordings(id) } : null;
    },
  });
}

export function useOutbox() {
  return useQuery({ ...localQuery, queryKey: localKeys.outbox, queryFn: listOutbox, refetchInterval: 3_000 });
}

/** The number shown beside the outbox in the navigation: items not yet delivered. */
export function useOutboxCount() {
  return useQuery({
    ...localQuery,
    queryKey: localKeys.outboxCount,
    queryFn: pendingOutboxCount,
    refetchInterval: 5_000,
  });
}

/** What would wait on the phone after a sign-out; only asked where the device keeps an outbox. */
export function useUnsentSummary(enabled: boolean) {
  return useQuery({ ...localQuery, queryKey: localKeys.unsent, queryFn: unsentSummary, enabled });
}

/**
 * A change to the phone's own store: it runs offline as well (the network plays no part) and then every local
 * query reads again.
 */
function useLocalMutation<TInput, TResult>(change: (input: TInput) => Promise<TResult>) {
  const queryClient = useQueryClient();
  return useMutation({
    networkMode: 'always',
    mutationFn: change,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: localKeys.root }),
  });
}

export const useAddClient = () => useLocalMutation((input: NewClient) => addClient(input));
export const useRecordConsent = () => useLocalMutation((input: NewConsent) => recordConsent(input));
export const useStartSession = () =>
  useLocalMutation((input: { clientId: string; consentId: string; clipSeconds?: number }) =>
    startSession(input),
  );
export const useDiscardSession = () => useLocalMutation((sessionId: string) => discardSession(sessionId));
export const useFinishSession = () => useLocalMutation((sessionId: string) => finishSession(sessionId));

/**
 * Fetches the clinic's sealing key while online, so sessions finished offline can still be sealed. Offline the
 * query pauses and resumes when the network returns; failures are retried.
 */
export function useClinicKeyPrefetch(): void {
  useQuery({
    queryKey: ['clinic-public-key'],
    queryFn: fetchClinicKey,
    networkMode: 'online',
    staleTime: 60 * 60 * 1000,
    retry: 5,
    retryDelay: (attempt) => Math.min(30_000, 1_000 * 2 ** attempt),
  });
}
