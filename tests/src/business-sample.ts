import type { BusinessSettings } from '../../shared/api/business';

/** The demo business's settings (PRODUCT.md's scenario) as GET /api/business answers them. */
export const businessSample: BusinessSettings = {
  name: 'Ridgeback Mobile Moto',
  ownerName: 'Morgan Avery',
  email: 'owner@ridgeback.test',
  phone: '555-0148',
  addressLines: ['41 Quarry Bend Road', 'Cinder Valley'],
  timezone: 'America/Denver',
  currency: 'USD',
  labourRateCents: 9500,
  partsMarkupBps: 2500,
  tripFeeBaseCents: 3500,
  tripFeePerMileCents: 150,
  tripFeeFreeMiles: 15,
  shopSuppliesBps: 0,
  taxRatePpm: 62_500,
  taxRounding: 'per_invoice',
  invoiceTermsDays: 14,
  invoiceFooter: null,
  updatedAt: '2026-11-18T15:00:00.000Z',
};
