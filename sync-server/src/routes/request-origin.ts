import type { Request } from 'express';
import type { Services } from '../composition-root';

/** The origin links in e-mails point at: configured, or the one the admin's browser used. */
export const linkBase = (services: Pick<Services, 'publicBaseUrl'>, req: Request): string =>
  services.publicBaseUrl ?? `${req.protocol}://${req.get('host')}`;

export const ipOf = (req: Request): string | null => req.ip ?? null;
