import { useQuery } from '@tanstack/react-query';
import { api, request } from '@/api/client';
import { ApiFailure, failureFromError, unwrap } from '@/api/result';
import { mailboxListSchema, mailboxMessageDetailSchema } from '@/shared/protocol/review';

export const mailboxKey = ['mailbox'] as const;

export function useMailboxQuery() {
  return useQuery({
    queryKey: mailboxKey,
    refetchInterval: 5000,
    queryFn: async () =>
      unwrap(await request({ method: 'GET', url: '/admin/mailbox/messages' }, mailboxListSchema)).messages,
  });
}

export function useMailboxMessageQuery(id: string | null) {
  return useQuery({
    queryKey: [...mailboxKey, id],
    enabled: Boolean(id),
    queryFn: async () =>
      unwrap(
        await request({ method: 'GET', url: `/admin/mailbox/messages/${id}` }, mailboxMessageDetailSchema),
      ),
  });
}

export async function openAttachment(messageId: string, index: number): Promise<void> {
  try {
    const response = await api.get(`/admin/mailbox/messages/${messageId}/attachments/${index}`, {
      responseType: 'blob',
    });
    window.open(URL.createObjectURL(response.data as Blob), '_blank');
  } catch (error) {
    throw new ApiFailure(failureFromError(error));
  }
}
