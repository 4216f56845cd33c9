import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { clinicConsentTextKey } from '@/device/consent/clinic-consent-text';
import {
  clinicRangesResponseSchema,
  clinicSettingsSchema,
  consentTextListResponseSchema,
  publishConsentTextResponseSchema,
  type ClinicSettingsInput,
  type PublishConsentTextRequest,
  type SetRangeRequest,
} from '@/shared/protocol/practice';

export const settingsKey = ['settings'] as const;
export const rangesKey = ['settings', 'ranges'] as const;

export function useSettingsQuery() {
  return useQuery({
    queryKey: settingsKey,
    queryFn: async () => unwrap(await request({ method: 'GET', url: '/settings' }, clinicSettingsSchema)),
  });
}

export function useSaveSettingsMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: ClinicSettingsInput) =>
      unwrap(await request({ method: 'PUT', url: '/settings', data: input }, clinicSettingsSchema)),
    onSuccess: () => qc.invalidateQueries({ queryKey: settingsKey }),
  });
}

export function useRangesQuery() {
  return useQuery({
    queryKey: rangesKey,
    queryFn: async () =>
      unwrap(await request({ method: 'GET', url: '/settings/ranges' }, clinicRangesResponseSchema)).ranges,
  });
}

export function useSetRangeMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async ({ metric, site, range }: { metric: string; site: string; range: SetRangeRequest }) =>
      unwrap(
        await request(
          { method: 'PUT', url: `/settings/ranges/${metric}/${site}`, data: range },
          clinicRangesResponseSchema,
        ),
      ).ranges,
    onSuccess: () => qc.invalidateQueries({ queryKey: rangesKey }),
  });
}

export function useResetRangesMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async () =>
      unwrap(await request({ method: 'DELETE', url: '/settings/ranges' }, clinicRangesResponseSchema)).ranges,
    onSuccess: () => qc.invalidateQueries({ queryKey: rangesKey }),
  });
}

export function useResetRangeMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async ({ metric, site }: { metric: string; site: string }) =>
      unwrap(
        await request(
          { method: 'DELETE', url: `/settings/ranges/${metric}/${site}` },
          clinicRangesResponseSchema,
        ),
      ).ranges,
    onSuccess: () => qc.invalidateQueries({ queryKey: rangesKey }),
  });
}

export const consentTextsKey = ['consent-texts'] as const;

export function useConsentTextsQuery() {
  return useQuery({
    queryKey: consentTextsKey,
    staleTime: 5 * 60_000,
    queryFn: async () =>
      unwrap(await request({ method: 'GET', url: '/consent-texts' }, consentTextListResponseSchema)).texts,
  });
}

/** Publishes a new version of the consent wording; the device's kept copy is refreshed with it. */
export function usePublishConsentTextMutation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (input: PublishConsentTextRequest) =>
      unwrap(
        await request(
          { method: 'POST', url: '/consent-texts', data: input },
          publishConsentTextResponseSchema,
        ),
      ).text,
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: consentTextsKey });
      await qc.invalidateQueries({ queryKey: clinicConsentTextKey });
    },
  });
}
