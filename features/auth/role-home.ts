import type { Role } from '@/shared/protocol';

const homes = { operator: '/clients', practitioner: '/sessions', admin: '/admin' } as const;

export type RoleHome = (typeof homes)[Role];

export function homeFor(role: Role): RoleHome {
  return homes[role];
}
