/**
 * Money in integer cents, never floats. Products are computed exactly with BigInt and rounded
 * half up to the cent once, as the Streamlined Sales and Use Tax Agreement §324 asks for tax
 * (compute to the third decimal, round up when it is greater than four).
 */
import type { TaxRounding } from './api/invoices';
import { clean } from './evaluators/types';

export interface MoneyLine {
  /** Thousandths of a unit: 1.5 labour hours = 1500. */
  quantityMilli: number;
  unitPriceCents: number;
  /** Basis points added on top of the unit price: 2500 = 25 % parts markup. */
  markupBps?: number;
  taxable: boolean;
}

/** Rounds numerator/denominator half up (away from zero for halves of negatives too). */
export function divRoundHalfUp(numerator: bigint, denominator: bigint): number {
  if (denominator <= 0n) throw new RangeError('denominator must be positive');
  const sign = numerator < 0n ? -1n : 1n;
  const abs = numerator * sign;
  const rounded = (abs * 2n + denominator) / (denominator * 2n);
  return Number(rounded * sign);
}

export function lineTotalCents(line: Omit<MoneyLine, 'taxable'>): number {
  const markup = BigInt(10_000 + (line.markupBps ?? 0));
  return divRoundHalfUp(BigInt(line.quantityMilli) * BigInt(line.unitPriceCents) * markup, 1000n * 10_000n);
}

/** Tax on an amount at a rate in parts per million (62500 = 6.25 %). */
export function taxCents(amountCents: number, ratePpm: number): number {
  return divRoundHalfUp(BigInt(amountCents) * BigInt(ratePpm), 1_000_000n);
}

export interface InvoiceTotals {
  lines: { totalCents: number; taxCents: number }[];
  subtotalCents: number;
  taxCents: number;
  totalCents: number;
}

/**
 * Totals for a list of lines. With `per_line` each taxable line's tax is rounded and the lines
 * summed; with `per_invoice` the taxable lines are summed and taxed once (SSUTA §324 allows both;
 * the invoice states which). Per-invoice line taxes are shown as 0 because only the sum exists.
 */
export function invoiceTotals(lines: MoneyLine[], ratePpm: number, rounding: TaxRounding): InvoiceTotals {
  const priced = lines.map((line) => {
    const totalCents = lineTotalCents(line);
    return {
      totalCents,
      taxCents: rounding === 'per_line' && line.taxable ? taxCents(totalCents, ratePpm) : 0,
    };
  });
  const subtotalCents = priced.reduce((sum, line) => sum + line.totalCents, 0);
  const taxableCents = priced.reduce((sum, line, i) => sum + (lines[i]?.taxable ? line.totalCents : 0), 0);
  const tax =
    rounding === 'per_line'
      ? priced.reduce((sum, line) => sum + line.taxCents, 0)
      : taxCents(taxableCents, ratePpm);
  return { lines: priced, subtotalCents, taxCents: tax, totalCents: subtotalCents + tax };
}

/** What a call-out costs: a base fee, then a price per mile past the miles the base covers. */
export interface TripFeeRule {
  tripFeeBaseCents: number;
  tripFeePerMileCents: number;
  tripFeeFreeMiles: number;
}

/**
 * The trip fee for a distance: the base, plus the per-mile price for each started mile beyond the
 * free miles (ceil(miles) − free, never below 0). Miles are cleaned of float noise first, so an
 * odometer difference 128.3 − 117.3 = 11.000000000000014 is charged as 11 miles, not 12.
 * @throws RangeError for negative or non-finite miles, or a rule that is not whole numbers ≥ 0.
 */
export function tripFeeCents(miles: number, rule: TripFeeRule): number {
  if (!Number.isFinite(miles) || miles < 0) throw new RangeError(`miles must be at least 0, not ${miles}`);
  const { tripFeeBaseCents, tripFeePerMileCents, tripFeeFreeMiles } = rule;
  for (const value of [tripFeeBaseCents, tripFeePerMileCents, tripFeeFreeMiles]) {
    if (!Number.isSafeInteger(value) || value < 0) {
      throw new RangeError(`trip fee rule needs whole numbers ≥ 0, not ${value}`);
    }
  }
  const chargedMiles = Math.max(0, Math.ceil(clean(miles)) - tripFeeFreeMiles);
  return tripFeeBaseCents + chargedMiles * tripFeePerMileCents;
}
