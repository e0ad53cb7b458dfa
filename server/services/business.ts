import { eq } from 'drizzle-orm';
import type { BusinessSettings, UpdateBusinessInput } from '../../shared/api/business';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { recordAudit } from './audit';
import { found } from './scope';

type Row = typeof t.businesses.$inferSelect;

/** The slug and ids stay on the server: they name the business in backups, not on a screen. */
function toSettings(row: Row): BusinessSettings {
  return {
    name: row.name,
    ownerName: row.ownerName,
    email: row.email,
    phone: row.phone,
    addressLines: row.addressLines,
    timezone: row.timezone,
    currency: row.currency,
    labourRateCents: row.labourRateCents,
    partsMarkupBps: row.partsMarkupBps,
    tripFeeBaseCents: row.tripFeeBaseCents,
    tripFeePerMileCents: row.tripFeePerMileCents,
    tripFeeFreeMiles: row.tripFeeFreeMiles,
    shopSuppliesBps: row.shopSuppliesBps,
    taxRatePpm: row.taxRatePpm,
    taxRounding: row.taxRounding,
    invoiceTermsDays: row.invoiceTermsDays,
    invoiceFooter: row.invoiceFooter,
    updatedAt: row.updatedAt.toISOString(),
  };
}

export async function getBusinessSettings(db: Db, actor: Actor): Promise<BusinessSettings> {
  const [row] = await db.select().from(t.businesses).where(eq(t.businesses.id, actor.businessId));
  return toSettings(found(row, 'business'));
}

/**
 * Changes the settings given and leaves the rest. Issued invoices keep the rate, rounding and
 * terms they were issued with (they are copied onto each invoice), so only later work sees this.
 * The audit entry lists each setting that changed, with its value before and after.
 */
export async function updateBusinessSettings(
  db: Db,
  actor: Actor,
  input: UpdateBusinessInput,
  now: Date,
): Promise<BusinessSettings> {
  return db.transaction(async (tx) => {
    const [current] = await tx
      .select()
      .from(t.businesses)
      .where(eq(t.businesses.id, actor.businessId))
      .for('update');
    const before = found(current, 'business');
    const [row] = await tx
      .update(t.businesses)
      .set({ ...input, updatedAt: now })
      .where(eq(t.businesses.id, actor.businessId))
      .returning();
    const changed = Object.fromEntries(
      Object.entries(input)
        .filter(([key, value]) => JSON.stringify(before[key as keyof Row]) !== JSON.stringify(value))
        .map(([key, value]) => [key, { from: before[key as keyof Row], to: value }]),
    );
    if (Object.keys(changed).length > 0) {
      await recordAudit(tx, {
        businessId: actor.businessId,
        actorId: actor.userId,
        action: 'business.updated',
        entityType: 'business',
        entityId: actor.businessId,
        details: changed,
        at: now,
      });
    }
    return toSettings(row!);
  });
}
