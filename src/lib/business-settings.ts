import { queryOptions } from '@tanstack/react-query';
import { BUSINESS_PATH, BusinessSettingsSchema } from '../../shared/api/business';
import { request } from './api-client';

/**
 * The business's rates and profile, under one cache key for every feature that reads them: the
 * settings page writes what it saved here, so the job page's totals use the new tax rate at once.
 */
export const businessSettingsQuery = () =>
  queryOptions({
    queryKey: ['business-settings'] as const,
    queryFn: ({ signal }) => request(BUSINESS_PATH, BusinessSettingsSchema, { signal }),
  });
