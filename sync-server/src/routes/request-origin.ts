import type { Request } from 'express';
import { practiceServices } from '../services/practice-services';

/** The origin links in e-mails point at: configured, or the one the admin's browser used. */
export const linkBase = (req: Request): string =>
  practiceServices().publicBaseUrl ?? `${req.protocol}://${req.get('host')}`;

export const ipOf = (req: Request): string | null => req.ip ?? null;
