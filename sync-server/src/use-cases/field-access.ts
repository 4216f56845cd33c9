import type { Role } from '@/shared/protocol';
import { fieldWriteRefusal } from '@/shared/protocol/field-access';
import type { SyncEntity } from '@/shared/protocol/sync';
import { AppError } from '../errors';

/**
 * The REST side of the field table: a route that changes a synced row checks the same rule as a sync push, so
 * widening a route's roles in the access table cannot let a role write a field it does not own.
 */
export function requireFieldWrites(role: Role, entity: SyncEntity, fields: readonly string[]): void {
  const refusal = fieldWriteRefusal(role, entity, fields);
  if (refusal) throw new AppError('field_not_writable', refusal, 403, { entity, fields });
}
