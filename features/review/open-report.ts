import { api } from '@/api/client';
import { ApiFailure, failureFromError } from '@/api/result';

/**
 * Opens the report PDF in a new browser tab to read before sending (the API needs the bearer token, so the tab
 * gets the file as an object URL). The tab is opened first, while the click still counts as the person's own.
 */
export async function openReportPreview(sessionId: string, compareWith: string | null): Promise<void> {
  const tab = window.open('', '_blank');
  try {
    const response = await api.get(`/review/sessions/${sessionId}/report`, {
      responseType: 'blob',
      params: compareWith ? { compareWith } : undefined,
    });
    const url = URL.createObjectURL(response.data as Blob);
    if (tab) tab.location.href = url;
    else window.location.assign(url);
    setTimeout(() => URL.revokeObjectURL(url), 60_000);
  } catch (error) {
    tab?.close();
    throw new ApiFailure(failureFromError(error));
  }
}
