import {
  keepPreviousData,
  useMutation,
  useQuery,
  useQueryClient,
  type QueryClient,
} from '@tanstack/react-query';
import { api, request } from '@/api/client';
import { ApiFailure, failureFromError, unwrap } from '@/api/result';
import { attentionKey } from '@/features/home/api';
import { siteSchema, type Site } from '@/shared/protocol';
import {
  comparisonSchema,
  earlierVisitsSchema,
  reportMailListSchema,
  reportMailResponseSchema,
  reviewNotesSchema,
  reviewSessionPageSchema,
  reviewSessionDetailSchema,
  sessionReferralSchema,
  staleNotesDetailsSchema,
  traceSchema,
  trendsSchema,
  type ReviewSessionPage,
  type ReviewSessionQuery,
  type SaveNotesRequest,
  type SetReferralFlagRequest,
  type StaleNotesDetails,
} from '@/shared/protocol/review';
import { z } from 'zod';

export const reviewSessionsKey = ['review-sessions'] as const;

export type SessionFilters = Omit<ReviewSessionQuery, 'cursor' | 'limit'>;

function params(
  filters: SessionFilters,
  cursor: string | null,
  limit: number,
): Record<string, string | number | boolean> {
  const out: Record<string, string | number | boolean> = { limit };
  for (const [k, v] of Object.entries(filters))
    if (v !== undefined && v !== null && v !== '') out[k] = v as string | number | boolean;
  if (cursor) out.cursor = cursor;
  return out;
}

export async function fetchReviewSessions(
  filters: SessionFilters,
  cursor: string | null,
  limit = 25,
): Promise<ReviewSessionPage> {
  return unwrap(
    await request(
      { method: 'GET', url: '/review/sessions', params: params(filters, cursor, limit) },
      reviewSessionPageSchema,
    ),
  );
}

/** One page of the review table; the previous page stays on screen while the next loads. */
export function useReviewSessionsQuery(filters: SessionFilters, cursor: string | null, limit = 25) {
  return useQuery({
    queryKey: [...reviewSessionsKey, filters, cursor, limit],
    queryFn: () => fetchReviewSessions(filters, cursor, limit),
    placeholderData: keepPreviousData,
  });
}

/** Everything read about one session (detail, traces, notes, mails) sits under the review root. */
export const reviewRootKey = ['review'] as const;
export const reviewKey = (sessionId: string) => [...reviewRootKey, sessionId] as const;

export function useSessionDetailQuery(sessionId: string) {
  return useQuery({
    queryKey: [...reviewKey(sessionId), 'detail'],
    queryFn: async () =>
      unwrap(
        await request({ method: 'GET', url: `/review/sessions/${sessionId}` }, reviewSessionDetailSchema),
      ),
  });
}

const traceQuery = (sessionId: string | null, site: Site) => ({
  queryKey: ['review', sessionId, 'trace', site],
  staleTime: Infinity,
  queryFn: async () =>
    unwrap(
      await request({ method: 'GET', url: `/review/sessions/${sessionId}/sites/${site}/trace` }, traceSchema),
    ),
});

export function useTraceQuery(sessionId: string | null, site: Site, enabled = true) {
  return useQuery({ ...traceQuery(sessionId, site), enabled: Boolean(sessionId) && enabled });
}

export function prefetchTraces(queryClient: QueryClient, sessionId: string): void {
  for (const site of siteSchema.options) {
    void queryClient.prefetchQuery(traceQuery(sessionId, site)).catch(() => undefined);
  }
}

export function useEarlierVisitsQuery(sessionId: string) {
  return useQuery({
    queryKey: [...reviewKey(sessionId), 'earlier'],
    queryFn: async () =>
      unwrap(
        await request({ method: 'GET', url: `/review/sessions/${sessionId}/earlier` }, earlierVisitsSchema),
      ).visits,
  });
}

export function useComparisonQuery(sessionId: string, otherId: string | null) {
  return useQuery({
    queryKey: [...reviewKey(sessionId), 'compare', otherId],
    enabled: Boolean(otherId),
    queryFn: async () =>
      unwrap(
        await request(
          { method: 'GET', url: `/review/sessions/${sessionId}/compare/${otherId}` },
          comparisonSchema,
        ),
      ),
  });
}

export function useTrendsQuery(clientId: string) {
  return useQuery({
    queryKey: ['trends', clientId],
    queryFn: async () =>
      unwrap(await request({ method: 'GET', url: `/review/clients/${clientId}/trends` }, trendsSchema)),
  });
}

/** A save refused because someone saved in between: both versions, for the practitioner to choose. */
export class StaleNotesError extends Error {
  constructor(readonly details: StaleNotesDetails) {
    super('Someone saved this session after you opened it.');
    this.name = 'StaleNotesError';
  }
}

export function useSaveNotesMutation(sessionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: SaveNotesRequest) => {
      try {
        const response = await api.put(`/review/sessions/${sessionId}/notes`, body);
        return z.object({ notes: reviewNotesSchema }).parse(response.data).notes;
      } catch (error) {
        const failure = failureFromError(error);
        const data = (error as { response?: { status?: number; data?: { error?: { details?: unknown } } } })
          .response;
        if (data?.status === 409) {
          const details = staleNotesDetailsSchema.safeParse(data.data?.error?.details);
          if (details.success) throw new StaleNotesError(details.data);
        }
        throw new ApiFailure(failure);
      }
    },
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: reviewKey(sessionId) });
      void queryClient.invalidateQueries({ queryKey: reviewSessionsKey });
    },
  });
}

export function useReferralFlagMutation(sessionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: SetReferralFlagRequest) =>
      unwrap(
        await request(
          { method: 'PUT', url: `/review/sessions/${sessionId}/referral-flag`, data: body },
          z.object({ referral: sessionReferralSchema }),
        ),
      ).referral,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: reviewKey(sessionId) });
      void queryClient.invalidateQueries({ queryKey: reviewSessionsKey });
    },
  });
}

const mailPreviewSchema = z.object({
  preview: z.object({
    to: z.string().nullable(),
    subject: z.string(),
    bodyText: z.string(),
    attachmentName: z.string(),
  }),
});

/** The report e-mail as it would go out; fetched only when the practitioner asks to see it. */
export function useReportMailPreviewQuery(sessionId: string, compareWith: string | null, enabled: boolean) {
  return useQuery({
    queryKey: [...reviewKey(sessionId), 'mail-preview', compareWith],
    enabled,
    queryFn: async () =>
      unwrap(
        await request(
          {
            method: 'GET',
            url: `/review/sessions/${sessionId}/report-mail-preview`,
            params: compareWith ? { compareWith } : undefined,
          },
          mailPreviewSchema,
        ),
      ).preview,
  });
}

export function useReportMailsQuery(sessionId: string) {
  return useQuery({
    queryKey: [...reviewKey(sessionId), 'mails'],
    queryFn: async () =>
      unwrap(
        await request(
          { method: 'GET', url: `/review/sessions/${sessionId}/report-mails` },
          reportMailListSchema,
        ),
      ).mails,
  });
}

export function useSendReportMutation(sessionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: { compareWith: string | null; to?: string }) =>
      unwrap(
        await request(
          { method: 'POST', url: `/review/sessions/${sessionId}/report-mails`, data: body },
          reportMailResponseSchema,
        ),
      ).mail,
    onSettled: () => void queryClient.invalidateQueries({ queryKey: [...reviewKey(sessionId), 'mails'] }),
  });
}

export function useRetryMailMutation(sessionId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (mailId: string) =>
      unwrap(
        await request(
          { method: 'POST', url: `/review/report-mails/${mailId}/retry` },
          reportMailResponseSchema,
        ),
      ).mail,
    // A mail that waited for the Retry button is on the admin's overview until it goes.
    onSettled: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: [...reviewKey(sessionId), 'mails'] }),
        queryClient.invalidateQueries({ queryKey: attentionKey }),
      ]),
  });
}

async function fetchBlob(url: string, params?: Record<string, string>): Promise<Blob> {
  try {
    const response = await api.get(url, { responseType: 'blob', params });
    return response.data as Blob;
  } catch (error) {
    throw new ApiFailure(failureFromError(error));
  }
}

/** The clip's WAV as an object URL (the API needs the bearer token, which an audio element cannot send). */
export async function fetchClipUrl(sessionId: string, site: Site): Promise<string> {
  return URL.createObjectURL(await fetchBlob(`/review/sessions/${sessionId}/sites/${site}/audio`));
}

/** Downloads the report PDF through the browser. */
export async function downloadReport(
  sessionId: string,
  compareWith: string | null,
  fileName: string,
): Promise<void> {
  const blob = await fetchBlob(
    `/review/sessions/${sessionId}/report`,
    compareWith ? { compareWith } : undefined,
  );
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  document.body.appendChild(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
