import { AppError } from '../../errors';
import { reviewServices } from './services';

/** Reads the local mail fake for the admin mailbox page; there is none where a real relay is configured. */
export async function readMailbox(
  pathAndQuery: string,
): Promise<{ status: number; contentType: string; body: Buffer; disposition: string | null }> {
  const base = reviewServices().mailboxUrl;
  if (!base)
    throw new AppError(
      'no_mailbox',
      'This server sends through a real mail relay; there is no local mailbox to read.',
      404,
    );
  let response: Response;
  try {
    response = await fetch(`${base}/api/messages${pathAndQuery}`);
  } catch {
    throw new AppError(
      'mailbox_unreachable',
      'The local mailbox is not running: start the fakes (npm start does).',
      502,
    );
  }
  return {
    status: response.status,
    contentType: response.headers.get('content-type') ?? 'application/octet-stream',
    disposition: response.headers.get('content-disposition'),
    body: Buffer.from(await response.arrayBuffer()),
  };
}
