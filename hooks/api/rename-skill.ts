import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SkillDto } from '@/shared/api/people';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const renameSkill = ({ id, name }: { id: number; name: string }) => apiFetch<SkillDto>(`/skills/${id}`, { method: 'PATCH', body: { name } });

export function useRenameSkill() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: renameSkill, onSuccess: () => queryClient.invalidateQueries({ queryKey: keys.skills._def }) });
}
