import { z } from 'zod';
import { listQuerySchema, versionField } from './paging';

export const skillBody = z.object({ name: z.string().trim().min(1, 'Enter a name').max(80, 'At most 80 characters') });

const personFields = {
  name: z.string().trim().min(1, 'Enter a name').max(120, 'At most 120 characters'),
  email: z.string().trim().max(254).email('This is not an e-mail address').nullable().optional(),
  contractedHours: z.number().min(0, 'Hours cannot be negative').max(168, 'A week has 168 hours'),
  skillIds: z.array(z.number().int().min(1)).max(200).default([]),
};
export const createPersonBody = z.object(personFields);
export const updatePersonBody = z.object({ ...personFields, version: versionField }).partial().required({ version: true });
export const peopleListQuery = listQuerySchema(['name', 'contractedHours', 'createdAt'] as const, 'name');

export interface PersonDto {
  id: number;
  name: string;
  email: string | null;
  contractedHours: number;
  skillIds: number[];
  userId: number | null;
  version: number;
}
export interface SkillDto {
  id: number;
  name: string;
}
