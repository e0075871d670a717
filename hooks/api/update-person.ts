import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { PersonDto, updatePersonBody } from '@/shared/api/people';
import { apiFetch } from './api-client';
import { personQueryOptions } from './get-person';
import { keys } from './query-keys';

/** Sends the version the form loaded; a 409 means someone else saved first (the form keeps its values). */
export const updatePerson = ({ id, ...input }: z.input<typeof updatePersonBody> & { id: number }) => apiFetch<PersonDto>(`/people/${id}`, { method: 'PATCH', body: input });

export function useUpdatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePerson,
    onSuccess: (person) => {
      queryClient.setQueryData(personQueryOptions(person.id).queryKey, person);
      void queryClient.invalidateQueries({ queryKey: keys.people.list._def });
      void queryClient.invalidateQueries({ queryKey: keys.skills._def });
    },
  });
}
