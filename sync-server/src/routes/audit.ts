import { auditQuerySchema } from '@/shared/protocol/practice';
import { callerOf } from '../middleware/authenticate';
import { readAuditLog } from '../use-cases/audit/audit-log';
import type { HandlerFactory } from './handlers';

export const auditLog: HandlerFactory = (deps) => async (req, res) => {
  res.json(await readAuditLog(deps, callerOf(req), auditQuerySchema.parse(req.query)));
};
