import type { Sequelize } from 'sequelize';
import type { Role } from '@/shared/protocol';
import type { Services } from '../composition-root';

/** Who is calling: set by the authenticate middleware from a verified token and a fresh user row. */
export interface Caller {
  userId: string;
  role: Role;
  clinicId: string;
  ip: string | null;
}

export interface UseCaseDeps {
  sequelize: Sequelize;
  jwtSecret: string;
  /** The blob store, keys, mail, payments and uploads, built once by the composition root and handed in. */
  services: Services;
}
