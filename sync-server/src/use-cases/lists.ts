import type { ClientSummary, SessionSummary, TeamMember } from '@/shared/protocol';
import { listClients } from '../repositories/clients-repository';
import { listSessions } from '../repositories/sessions-repository';
import { listUsers } from '../repositories/users-repository';
import type { Caller } from './context';

export const findClients = (caller: Caller, q?: string): Promise<ClientSummary[]> =>
  listClients(caller.clinicId, q);
export const findSessions = (caller: Caller): Promise<SessionSummary[]> => listSessions(caller.clinicId);
export const findTeam = (caller: Caller): Promise<TeamMember[]> => listUsers(caller.clinicId);
