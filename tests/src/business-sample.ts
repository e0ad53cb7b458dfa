import type { BusinessSettings } from '../../shared/api/business';
import { demoBusiness } from '../../server/db/seed-data';

const { slug: _slug, ...profile } = demoBusiness;

/**
 * The demo business (PRODUCT.md's scenario, server/db/seed-data.ts) as GET /api/business answers
 * for it, with no invoice footer set.
 */
export const businessSample: BusinessSettings = {
  ...profile,
  addressLines: [...profile.addressLines],
  currency: 'USD',
  shopSuppliesBps: 0,
  taxRounding: 'per_invoice',
  invoiceFooter: null,
  updatedAt: '2026-11-18T15:00:00.000Z',
};
