import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SkillDto } from '@/shared/api/people';
import { apiFetch } from './api-client';

export type { SkillDto };

export const getSkills = () => apiFetch<{ items: SkillDto[] }>('/skills').then((r) => r.items);

export const skillsQueryOptions = () => queryOptions({ queryKey: ['skills'], queryFn: getSkills });

export const useSkills = () => useQuery(skillsQueryOptions());
