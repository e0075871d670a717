import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { createPersonBody, PersonDto } from '@/shared/api/people';
import { apiFetch } from './api-client';
import { keys } from './query-keys';

export const createPerson = (input: z.input<typeof createPersonBody>) => apiFetch<PersonDto>('/people', { method: 'POST', body: input });

export function useCreatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createPerson,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: keys.people._def });
      void queryClient.invalidateQueries({ queryKey: keys.skills._def });
    },
  });
}
