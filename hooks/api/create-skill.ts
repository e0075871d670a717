import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SkillDto } from '@/shared/api/people';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const createSkill = (input: { name: string }) => apiFetch<SkillDto>('/skills', { method: 'POST', body: input });

export function useCreateSkill() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createSkill, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.skills._def }) });
}
