import { useQuery } from '@tanstack/react-query';
import { request } from '@/api/client';
import { unwrap } from '@/api/result';
import { userListResponseSchema, type TeamMember } from '@/shared/protocol';

export const usersKey = ['users'] as const;

export async function fetchTeam(): Promise<TeamMember[]> {
  const data = unwrap(await request({ method: 'GET', url: '/users' }, userListResponseSchema));
  return data.users;
}

export function useTeamQuery() {
  return useQuery({ queryKey: usersKey, queryFn: fetchTeam });
}
