/**
 * The one place the dashboard turns integer cents into text. Whole-number arithmetic only, so no
 * float ever rounds a cent (shared/money.ts keeps every amount in cents for the same reason). The
 * business bills in US dollars: its default currency, and the IRS mileage rates it deducts at.
 */
const dollarGroups = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 });

type FormatCentsOptions = {
  /** Drop the cents, halves rounded away from zero: for chart axes, where "$1,500" reads faster than "$1,500.00". */
  wholeDollars?: boolean;
};

/**
 * "$1,234.56", "-$12.00" (a refund), "$0.00".
 * @throws RangeError for a value that is not a whole number of cents: a bug upstream, not an amount.
 */
export function formatCents(cents: number, { wholeDollars = false }: FormatCentsOptions = {}): string {
  if (!Number.isSafeInteger(cents)) throw new RangeError(`cents must be a whole number, not ${cents}`);
  const sign = cents < 0 ? '-' : '';
  const abs = Math.abs(cents);
  if (wholeDollars) return `${sign}$${dollarGroups.format(Math.floor((abs + 50) / 100))}`;
  const dollars = Math.floor(abs / 100);
  const rest = String(abs % 100).padStart(2, '0');
  return `${sign}$${dollarGroups.format(dollars)}.${rest}`;
}
