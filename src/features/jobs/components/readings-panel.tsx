import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { FormField, SelectField } from '../../../components/ui/form-field';
import { Panel } from '../../../components/ui/panel';
import { StatusPill } from '../../../components/ui/status-pill';
import { QUANTITIES, type Quantity, type Reading } from '../../../../shared/api/readings';
import {
  formatMeasurement,
  readingToCanonical,
  UnitError,
  UNITS,
  type UnitId,
} from '../../../../shared/units';
import { jobQueries } from '../api/queries';
import { useAddReading } from '../api/mutations';
import { errorText } from '../../../lib/error-text';
import { formatWhen } from './job-format';

const EXAMPLES: Record<Quantity, string> = {
  pressure: '43psi or 3bar',
  voltage: '12.4V',
  flow: '0.5L/min or 30gal/h',
  compression: '120psi',
  afr: '14.7',
  resistance: '3.2ohm',
  duration: '30s',
  volume: '250mL',
  temperature: '68F',
};

/** As the mechanic typed it: the unit chosen at the roadside, never a converted one. */
function entered(reading: Reading): string {
  const unit = reading.enteredUnit as UnitId;
  return unit in UNITS ? formatMeasurement(reading.enteredValue, unit, 2) : `${reading.enteredValue} ${unit}`;
}

/** What the typed text will be stored as, or why it cannot be, checked on every keystroke. */
function preview(
  quantity: Quantity,
  text: string,
): { ok: true; text: string } | { ok: false; text: string } | null {
  if (text.trim() === '') return null;
  try {
    // The air-fuel ratio is a bare number; every other quantity needs its unit typed.
    const reading = readingToCanonical(quantity, text, quantity === 'afr' ? 'ratio' : undefined);
    return { ok: true, text: `Stored as ${formatMeasurement(reading.value, reading.unit, 2)}` };
  } catch (error) {
    if (error instanceof UnitError) return { ok: false, text: error.message };
    throw error;
  }
}

export function ReadingsPanel({ jobId, mayAdd }: { jobId: number; mayAdd: boolean }) {
  const readings = useQuery(jobQueries.readings(jobId));
  const add = useAddReading(jobId);
  const [quantity, setQuantity] = useState<Quantity>('pressure');
  const [value, setValue] = useState('');
  const check = preview(quantity, value);
  const items = readings.data?.items ?? [];

  return (
    <Panel>
      <h2 className="text-xl font-bold">Readings</h2>
      {readings.isPending ? <p className="mt-2 text-lg text-ink-soft">Loading readings…</p> : null}
      {readings.isError ? (
        <p role="alert" className="mt-2 text-lg font-bold text-fail">
          The readings could not be loaded: {errorText(readings.error)}
        </p>
      ) : null}
      {readings.isSuccess && items.length === 0 ? (
        <p className="mt-2 max-w-prose text-lg text-ink-soft">
          No readings yet. Add one below, run a guided check, or from the van:{' '}
          <code className="font-mono font-bold">vanbay reading add {jobId} pressure 43psi</code>.
        </p>
      ) : null}
      {items.length > 0 ? (
        <div className="mt-3 overflow-x-auto">
          <table className="w-full border-collapse text-left text-base">
            <thead>
              <tr className="border-b-2 border-ink">
                <th scope="col" className="py-2 pr-4">
                  What
                </th>
                <th scope="col" className="py-2 pr-4 text-right">
                  Reading
                </th>
                <th scope="col" className="py-2 pr-4">
                  Verdict
                </th>
                <th scope="col" className="py-2">
                  Taken
                </th>
              </tr>
            </thead>
            <tbody>
              {items.map((reading) => (
                <tr key={reading.id} className="border-b border-rule align-top last:border-b-0">
                  <th scope="row" className="py-2 pr-4 font-bold">
                    {reading.quantity}
                    {reading.stepKey ? (
                      <span className="block text-sm font-medium text-ink-soft">
                        in check step {reading.stepKey}
                      </span>
                    ) : null}
                  </th>
                  <td className="py-2 pr-4 text-right text-lg font-bold whitespace-nowrap tabular-nums">
                    {entered(reading)}
                  </td>
                  <td className="py-2 pr-4">
                    {reading.judgement ? (
                      <>
                        <StatusPill tone={reading.judgement.verdict}>{reading.judgement.verdict}</StatusPill>
                        {reading.judgement.basis === 'reading' ? (
                          <span className="mt-1 block max-w-sm">{reading.judgement.reason}</span>
                        ) : (
                          <span className="mt-1 block text-sm text-ink-soft">the check step’s verdict</span>
                        )}
                        {reading.judgement.specSource === 'generic' &&
                        !/service manual/.test(reading.judgement.reason) ? (
                          <span className="block text-sm text-ink-soft">
                            generic — confirm in the service manual
                          </span>
                        ) : null}
                      </>
                    ) : (
                      <span className="text-ink-soft">no limit to judge it by</span>
                    )}
                  </td>
                  <td className="py-2 whitespace-nowrap">{formatWhen(reading.takenAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {mayAdd ? (
        <form
          className="mt-4 grid gap-3 border-t-2 border-rule pt-4 sm:grid-cols-[minmax(0,1fr)_minmax(0,2fr)] sm:items-start"
          onSubmit={(event) => {
            event.preventDefault();
            if (!check?.ok) return;
            add.mutate({ quantity, value: value.trim() }, { onSuccess: () => setValue('') });
          }}
        >
          <SelectField
            label="What was measured"
            value={quantity}
            options={QUANTITIES.map((q) => ({ value: q, label: q }))}
            onChange={(event) => setQuantity(event.target.value as Quantity)}
          />
          <FormField
            label="Reading"
            hint={`With its unit, as read: ${EXAMPLES[quantity]}`}
            value={value}
            autoComplete="off"
            onChange={(event) => setValue(event.target.value)}
            error={check && !check.ok ? check.text : undefined}
            feedback={check?.ok ? <p className="text-base text-ink-soft">{check.text}</p> : null}
          />
          <Button
            type="submit"
            className="justify-self-start sm:col-span-2"
            disabled={add.isPending || !check?.ok}
          >
            {add.isPending ? 'Saving…' : 'Add reading'}
          </Button>
          <div className="sm:col-span-2" aria-live="polite">
            {add.isSuccess ? (
              <p className="flex flex-wrap items-center gap-2 text-lg">
                Saved {entered(add.data)}.
                {add.data.judgement ? (
                  <>
                    <StatusPill tone={add.data.judgement.verdict}>{add.data.judgement.verdict}</StatusPill>
                    {add.data.judgement.reason}
                  </>
                ) : null}
              </p>
            ) : null}
            {add.isError ? (
              <p role="alert" className="text-base font-bold text-fail">
                Not saved: {errorText(add.error)}
              </p>
            ) : null}
          </div>
        </form>
      ) : null}
    </Panel>
  );
}
