import { tripFeeCents } from '../../../../shared/money';
import { LoadFailure, Loading } from '../../../components/ui/load-failure';
import { formatCents } from '../../../lib/money';
import { useBusinessSettings } from '../api/queries';
import { codecs } from './settings-fields';
import type { SettingField } from './settings-fields';
import { SettingsSection } from './settings-section';

// Module scope: each section's fields are its form's schema, built once.
const PROFILE: readonly SettingField[] = [
  { key: 'name', label: 'Business name', kind: 'text' },
  { key: 'ownerName', label: 'Your name', kind: 'text' },
  {
    key: 'email',
    label: 'E-mail',
    hint: 'Printed on invoices; replies to invoice mail come here',
    kind: 'text',
    inputMode: 'email',
  },
  { key: 'phone', label: 'Phone (optional)', kind: 'optional-text', inputMode: 'tel' },
  { key: 'addressLines', label: 'Address', hint: 'One line each, as printed on the invoice', kind: 'lines' },
];

const RATES: readonly SettingField[] = [
  {
    key: 'labourRateCents',
    label: 'Labour rate ($ per hour)',
    hint: 'New labour lines start at this rate',
    kind: 'cents',
  },
  { key: 'partsMarkupBps', label: 'Parts markup (%)', hint: 'Added on top of a part’s cost', kind: 'bps' },
];

const TRIP_FEE: readonly SettingField[] = [
  { key: 'tripFeeBaseCents', label: 'Call-out fee ($)', hint: 'Charged on every trip', kind: 'cents' },
  {
    key: 'tripFeeFreeMiles',
    label: 'Miles the call-out covers',
    hint: 'Whole miles included in the fee',
    kind: 'whole',
    inputMode: 'numeric',
  },
  { key: 'tripFeePerMileCents', label: 'Each mile past those ($)', kind: 'cents' },
];

const TAX: readonly SettingField[] = [
  { key: 'taxRatePpm', label: 'Sales tax rate (%)', hint: 'Your combined state and local rate', kind: 'ppm' },
  {
    key: 'taxRounding',
    label: 'Round the tax',
    hint: 'Once on the invoice’s taxable total, or on each line and then added up',
    kind: 'choice',
    options: [
      { value: 'per_invoice', label: 'Once per invoice' },
      { value: 'per_line', label: 'On each line' },
    ],
  },
];

const TERMS: readonly SettingField[] = [
  {
    key: 'invoiceTermsDays',
    label: 'Days to pay',
    hint: 'The due date is the issue day plus these days',
    kind: 'whole',
    inputMode: 'numeric',
  },
  {
    key: 'invoiceFooter',
    label: 'Closing line (optional)',
    hint: 'Printed at the foot of each invoice',
    kind: 'optional-text',
    long: true,
  },
];

/** The business's profile and its money settings, a section each. */
export function BusinessSettingsPanel() {
  const settings = useBusinessSettings();
  if (settings.isPending) return <Loading>Loading the business settings…</Loading>;
  if (settings.isError) {
    return (
      <LoadFailure
        title="The business settings could not be loaded"
        error={settings.error}
        onRetry={() => void settings.refetch()}
        retrying={settings.isFetching}
      />
    );
  }
  const current = settings.data;
  return (
    <div className="grid gap-6">
      <SettingsSection
        title="Business profile"
        about={`How the business is named on invoices and in mail. Its calendar runs in ${current.timezone}; amounts are in ${current.currency}.`}
        fields={PROFILE}
        settings={current}
      />
      <SettingsSection
        title="Rates"
        about="What new work is priced at. Invoices already issued keep the prices they were issued with."
        fields={RATES}
        settings={current}
      />
      <SettingsSection
        title="Trip fee"
        about="The rule a trip line is priced by: a call-out fee, then a price for each started mile past the miles it covers."
        fields={TRIP_FEE}
        settings={current}
        preview={(texts) => <TripFeeExamples texts={texts} />}
      />
      <SettingsSection
        title="Tax"
        about="The rate and rounding new invoices are figured with; each invoice keeps the ones it was issued with."
        fields={TAX}
        settings={current}
      />
      <SettingsSection
        title="Invoice terms"
        about="When payment is due, and the line the invoice ends with."
        fields={TERMS}
        settings={current}
      />
    </div>
  );
}

const EXAMPLE_MILES = [10, 25, 40] as const;

/** Worked examples of the rule as typed, figured by the same function the server bills with. */
function TripFeeExamples({ texts }: { texts: Partial<Record<string, string>> }) {
  const base = codecs.cents.read(texts['tripFeeBaseCents'] ?? '');
  const perMile = codecs.cents.read(texts['tripFeePerMileCents'] ?? '');
  const free = codecs.whole.read(texts['tripFeeFreeMiles'] ?? '');
  if (typeof base !== 'number' || typeof perMile !== 'number' || typeof free !== 'number') return null;
  const rule = { tripFeeBaseCents: base, tripFeePerMileCents: perMile, tripFeeFreeMiles: free };
  return (
    <p className="text-base" aria-live="polite">
      <span className="font-bold">With these figures: </span>
      {EXAMPLE_MILES.map((miles) => `${miles} miles ${formatCents(tripFeeCents(miles, rule))}`).join(' · ')}
    </p>
  );
}
