import { useMutation, useQueryClient } from '@tanstack/react-query';
import { CUSTOMERS_PATH, CustomerSchema } from '../../../../shared/api/customers';
import type { CreateCustomerInput, UpdateCustomerInput } from '../../../../shared/api/customers';
import { jsonInit, request } from '../../../lib/api-client';
import { customerPath, customerQueries } from './queries';

/** A new customer joins the lists (any search may match it); no detail is cached yet to update. */
export function useCreateCustomer() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateCustomerInput) =>
      request(CUSTOMERS_PATH, CustomerSchema, jsonInit('POST', input)),
    onSuccess: (customer) => {
      queryClient.setQueryData(customerQueries.detail(customer.id).queryKey, customer);
      return queryClient.invalidateQueries({ queryKey: customerQueries.lists() });
    },
  });
}

/** The answer is the saved record: it replaces the cached detail, and the lists re-read their rows. */
export function useUpdateCustomer(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UpdateCustomerInput) =>
      request(customerPath(id), CustomerSchema, jsonInit('PATCH', input)),
    onSuccess: (customer) => {
      queryClient.setQueryData(customerQueries.detail(id).queryKey, customer);
      return queryClient.invalidateQueries({ queryKey: customerQueries.lists() });
    },
  });
}
