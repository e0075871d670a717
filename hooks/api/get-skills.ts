import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SkillDto } from '@/shared/api/people';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export type { SkillDto };

export const getSkills = () => apiFetch<{ items: SkillDto[] }>('/skills').then((r) => r.items);

export const skillsQueryOptions = () => queryOptions({ queryKey: keys.skills.list.queryKey, queryFn: getSkills });

export const useSkills = () => useQuery(skillsQueryOptions());
