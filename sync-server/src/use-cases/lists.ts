import type { ClientSummary, SessionSummary } from '@/shared/protocol';
import { listClients } from '../repositories/clients-repository';
import { listSessions } from '../repositories/sessions-repository';
import type { Caller, UseCaseDeps } from './context';

export const findClients = (deps: UseCaseDeps, caller: Caller, q?: string): Promise<ClientSummary[]> =>
  listClients(deps.sequelize, caller.clinicId, q);
export const findSessions = (deps: UseCaseDeps, caller: Caller): Promise<SessionSummary[]> =>
  listSessions(deps.sequelize, caller.clinicId);
