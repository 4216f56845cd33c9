import type { Role } from '@/shared/protocol';

export const roleLabels: Record<Role, string> = {
  operator: 'Operator',
  practitioner: 'Practitioner',
  admin: 'Admin',
};
