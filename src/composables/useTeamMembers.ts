import { z } from 'zod';
import type { Ref } from 'vue';
import { api } from '@/api/client';
import { memberSchema } from '@shared/model/teams';
import { useApiData } from './useApiData';

const membersSchema = z.array(memberSchema);

/** The members of a team (names and roles for @mentions and review requests). */
export function useTeamMembers(teamId: Ref<string | null>) {
  return useApiData(async () => (teamId.value ? api.get(`/api/teams/${teamId.value}/members`, membersSchema) : []), [teamId]);
}
