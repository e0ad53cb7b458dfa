import { useMutation, useQueryClient } from '@tanstack/react-query';
import { BUSINESS_PATH, BusinessSettingsSchema } from '../../../../shared/api/business';
import type { BusinessSettings, UpdateBusinessInput } from '../../../../shared/api/business';
import { USERS_PATH, UserSchema } from '../../../../shared/api/users';
import type { CreateUserInput, UpdateUserInput, User } from '../../../../shared/api/users';
import { jsonInit, request } from '../../../lib/api-client';
import { settingsQueries } from './queries';

export function updateBusiness(input: UpdateBusinessInput): Promise<BusinessSettings> {
  return request(BUSINESS_PATH, BusinessSettingsSchema, jsonInit('PATCH', input));
}

/** Each settings section has its own, so one section's "saved" is not another's. */
export function useUpdateBusiness() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateBusiness,
    // The answer is the whole settings as they now stand: nothing else to fetch.
    onSuccess: (saved) => queryClient.setQueryData(settingsQueries.business().queryKey, saved),
  });
}

export function createUser(input: CreateUserInput): Promise<User> {
  return request(USERS_PATH, UserSchema, jsonInit('POST', input));
}

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: settingsQueries.users().queryKey }),
  });
}

export function updateUser(id: number, input: UpdateUserInput): Promise<User> {
  return request(`${USERS_PATH}/${id}`, UserSchema, jsonInit('PATCH', input));
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number; input: UpdateUserInput }) => updateUser(id, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: settingsQueries.users().queryKey }),
  });
}
