import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { FormField, SelectField } from '../../../components/ui/form-field';
import { Panel } from '../../../components/ui/panel';
import type { BusinessSettings } from '../../../../shared/api/business';
import { LINE_ITEM_KINDS, type LineItemKind } from '../../../../shared/api/jobs';
import { quantityToMilli, type LineItem } from '../../../../shared/api/line-items';
import { invoiceTotals, lineTotalCents } from '../../../../shared/money';
import { parseScaled, scaledToText } from '../../../lib/decimal-input';
import { errorText } from '../../../lib/error-text';
import { formatCents } from '../../../lib/money';
import { jobQueries } from '../api/queries';
import { useAddLineItem, useDeleteLineItem, useUpdateLineItem } from '../api/mutations';

/** What the mechanic has typed into a line's boxes, before it is saved. */
type Draft = { quantity: string; price: string };

/** Labour and the trip are not taxable unless said otherwise; goods are (shared/api/line-items.ts). */
const TAXABLE_BY_DEFAULT: Record<LineItemKind, boolean> = {
  labour: false,
  trip: false,
  part: true,
  supplies: true,
  other: true,
};

function draftOf(item: LineItem): Draft {
  return { quantity: String(item.quantity), price: scaledToText(item.unitPriceCents, 2) };
}

/** A draft as numbers, or why it cannot be: the same rules the server applies. */
function readDraft(
  draft: Draft,
): { ok: true; quantityMilli: number; priceCents: number } | { ok: false; reason: string } {
  const quantityMilli = quantityToMilli(draft.quantity);
  if (quantityMilli === null) return { ok: false, reason: 'Quantity: above 0, at most 3 decimals (1.5)' };
  const price = parseScaled(draft.price, 2);
  if (!price.ok) return { ok: false, reason: `Price ${price.reason}` };
  return { ok: true, quantityMilli, priceCents: price.value };
}

/**
 * The job's lines and what they come to. Totals are figured here with the same shared money code
 * the invoice uses, from what is typed in the boxes, so they move as the mechanic types; the saved
 * line's own total comes back from the server.
 */
export function LineItemsPanel({ jobId, mayEdit }: { jobId: number; mayEdit: boolean }) {
  const items = useQuery(jobQueries.lineItems(jobId));
  const business = useQuery(jobQueries.business());
  const [drafts, setDrafts] = useState<Record<number, Draft>>({});
  const lines = items.data?.items ?? [];

  const priced = lines.map((item) => {
    const draft = drafts[item.id];
    const read = draft ? readDraft(draft) : null;
    return {
      item,
      quantityMilli: read?.ok ? read.quantityMilli : item.quantityMilli,
      unitPriceCents: read?.ok ? read.priceCents : item.unitPriceCents,
      problem: read && !read.ok ? read.reason : null,
    };
  });

  return (
    <Panel>
      <h2 className="text-xl font-bold">Work and parts</h2>
      {items.isPending ? <p className="mt-2 text-lg text-ink-soft">Loading the lines…</p> : null}
      {items.isError ? (
        <p role="alert" className="mt-2 text-lg font-bold text-fail">
          The lines could not be loaded: {errorText(items.error)}
        </p>
      ) : null}
      {items.isSuccess && lines.length === 0 ? (
        <p className="mt-2 max-w-prose text-lg text-ink-soft">
          No labour or parts on this job yet.{' '}
          {mayEdit ? 'Add them below, or add a finished check’s suggested lines.' : ''}
        </p>
      ) : null}
      {lines.length > 0 ? (
        <div className="mt-3 overflow-x-auto">
          <table className="w-full border-collapse text-left text-base">
            <thead>
              <tr className="border-b-2 border-ink">
                <th scope="col" className="py-2 pr-3">
                  Line
                </th>
                <th scope="col" className="py-2 pr-3 text-right">
                  Quantity
                </th>
                <th scope="col" className="py-2 pr-3 text-right">
                  Unit price
                </th>
                <th scope="col" className="py-2 pr-3 text-right">
                  Total
                </th>
                {mayEdit ? (
                  <th scope="col" className="py-2">
                    <span className="sr-only">Actions</span>
                  </th>
                ) : null}
              </tr>
            </thead>
            <tbody>
              {priced.map(({ item, quantityMilli, unitPriceCents, problem }) => (
                <LineRow
                  key={item.id}
                  jobId={jobId}
                  item={item}
                  mayEdit={mayEdit}
                  draft={drafts[item.id]}
                  problem={problem}
                  totalCents={lineTotalCents({ quantityMilli, unitPriceCents, markupBps: item.markupBps })}
                  onDraft={(draft) => setDrafts((all) => ({ ...all, [item.id]: draft }))}
                  onSettled={() =>
                    setDrafts((all) => {
                      const { [item.id]: _gone, ...rest } = all;
                      return rest;
                    })
                  }
                />
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {lines.length > 0 ? <Totals business={business.data} priced={priced} /> : null}
      {mayEdit ? <AddLine jobId={jobId} /> : null}
    </Panel>
  );
}

function Totals({
  business,
  priced,
}: {
  business: BusinessSettings | undefined;
  priced: { item: LineItem; quantityMilli: number; unitPriceCents: number }[];
}) {
  if (!business) return <p className="mt-3 text-base text-ink-soft">Working out the tax…</p>;
  const totals = invoiceTotals(
    priced.map(({ item, quantityMilli, unitPriceCents }) => ({
      quantityMilli,
      unitPriceCents,
      markupBps: item.markupBps,
      taxable: item.taxable,
    })),
    business.taxRatePpm,
    business.taxRounding,
  );
  return (
    <dl
      className="mt-4 grid max-w-sm grid-cols-[1fr_auto] gap-x-6 gap-y-1 justify-self-end text-lg"
      aria-live="polite"
    >
      <dt>Subtotal</dt>
      <dd className="text-right tabular-nums" data-testid="subtotal">
        {formatCents(totals.subtotalCents)}
      </dd>
      <dt>Tax at {scaledToText(business.taxRatePpm, 4, { trim: true })} %</dt>
      <dd className="text-right tabular-nums">{formatCents(totals.taxCents)}</dd>
      <dt className="font-bold">Total</dt>
      <dd className="text-right font-bold tabular-nums" data-testid="total">
        {formatCents(totals.totalCents)}
      </dd>
    </dl>
  );
}

type LineRowProps = {
  jobId: number;
  item: LineItem;
  mayEdit: boolean;
  draft: Draft | undefined;
  problem: string | null;
  totalCents: number;
  onDraft: (draft: Draft) => void;
  onSettled: () => void;
};

function LineRow({ jobId, item, mayEdit, draft, problem, totalCents, onDraft, onSettled }: LineRowProps) {
  const update = useUpdateLineItem(jobId);
  const remove = useDeleteLineItem(jobId);
  const shown = draft ?? draftOf(item);
  const changed =
    draft !== undefined && (draft.quantity !== draftOf(item).quantity || draft.price !== draftOf(item).price);
  const save = () => {
    if (!draft) return;
    const read = readDraft(draft);
    if (!read.ok) return;
    update.mutate(
      { itemId: item.id, quantity: read.quantityMilli / 1000, unitPriceCents: read.priceCents },
      { onSuccess: onSettled },
    );
  };
  return (
    <tr className="border-b border-rule align-top last:border-b-0">
      <th scope="row" className="py-2 pr-3 font-bold">
        {item.description}
        <span className="block text-sm font-medium text-ink-soft">
          {item.kind}
          {item.partNumber ? ` · ${item.partNumber}` : ''}
          {item.markupBps > 0 ? ` · ${scaledToText(item.markupBps, 2, { trim: true })} % markup` : ''}
          {item.taxable ? ' · taxable' : ''}
        </span>
        {item.needsPrice ? <span className="block text-sm font-bold text-warn">Needs its price</span> : null}
        {problem ? (
          <span role="alert" className="block text-sm font-bold text-fail">
            {problem}
          </span>
        ) : null}
        {update.isError ? (
          <span role="alert" className="block text-sm font-bold text-fail">
            Not saved: {errorText(update.error)}
          </span>
        ) : null}
      </th>
      <td className="py-2 pr-3 text-right">
        {mayEdit ? (
          <input
            aria-label={`Quantity of ${item.description}`}
            inputMode="decimal"
            className="min-h-touch w-24 rounded-plate border-2 border-ink bg-panel px-2 text-right text-lg tabular-nums"
            value={shown.quantity}
            onChange={(event) => onDraft({ ...shown, quantity: event.target.value })}
            onKeyDown={(event) => event.key === 'Enter' && save()}
          />
        ) : (
          <span className="tabular-nums">{item.quantity}</span>
        )}
      </td>
      <td className="py-2 pr-3 text-right">
        {mayEdit ? (
          <input
            aria-label={`Unit price of ${item.description} in dollars`}
            inputMode="decimal"
            className="min-h-touch w-28 rounded-plate border-2 border-ink bg-panel px-2 text-right text-lg tabular-nums"
            value={shown.price}
            onChange={(event) => onDraft({ ...shown, price: event.target.value })}
            onKeyDown={(event) => event.key === 'Enter' && save()}
          />
        ) : (
          <span className="tabular-nums">{formatCents(item.unitPriceCents)}</span>
        )}
      </td>
      <td className="py-2 pr-3 text-right text-lg font-bold tabular-nums">{formatCents(totalCents)}</td>
      {mayEdit ? (
        <td className="py-2">
          <div className="flex gap-2">
            {changed ? (
              <Button onClick={save} disabled={update.isPending || problem !== null}>
                {update.isPending ? 'Saving…' : 'Save'}
              </Button>
            ) : null}
            <Button
              variant="secondary"
              aria-label={`Remove ${item.description}`}
              disabled={remove.isPending}
              onClick={() => remove.mutate(item.id)}
            >
              {remove.isPending ? 'Removing…' : 'Remove'}
            </Button>
          </div>
        </td>
      ) : null}
    </tr>
  );
}

function AddLine({ jobId }: { jobId: number }) {
  const add = useAddLineItem(jobId);
  const [kind, setKind] = useState<LineItemKind>('labour');
  const [description, setDescription] = useState('');
  const [quantity, setQuantity] = useState('1');
  const [price, setPrice] = useState('');
  // A labour line left without a price takes the business's labour rate (the server fills it in).
  const priceNeeded = kind !== 'labour' || price.trim() !== '';
  const read = readDraft({ quantity, price: price.trim() === '' ? '0' : price });
  const ready = description.trim() !== '' && read.ok;

  return (
    <form
      className="mt-4 grid gap-3 border-t-2 border-rule pt-4 sm:grid-cols-2 sm:items-start"
      onSubmit={(event) => {
        event.preventDefault();
        if (!ready || !read.ok) return;
        add.mutate(
          {
            kind,
            description: description.trim(),
            quantity: read.quantityMilli / 1000,
            ...(priceNeeded ? { unitPriceCents: read.priceCents } : {}),
            taxable: TAXABLE_BY_DEFAULT[kind],
          },
          {
            onSuccess: () => {
              setDescription('');
              setQuantity('1');
              setPrice('');
            },
          },
        );
      }}
    >
      <SelectField
        label="Kind"
        value={kind}
        options={LINE_ITEM_KINDS.map((k) => ({ value: k, label: k }))}
        onChange={(event) => setKind(event.target.value as LineItemKind)}
      />
      <FormField
        label="Description"
        value={description}
        maxLength={200}
        onChange={(e) => setDescription(e.target.value)}
      />
      <FormField
        label="Quantity"
        inputMode="decimal"
        value={quantity}
        onChange={(e) => setQuantity(e.target.value)}
      />
      <FormField
        label="Unit price ($)"
        hint={kind === 'labour' ? 'Empty: the labour rate' : undefined}
        inputMode="decimal"
        value={price}
        onChange={(e) => setPrice(e.target.value)}
        error={!read.ok && (quantity !== '' || price !== '') ? read.reason : undefined}
      />
      <Button type="submit" className="justify-self-start sm:col-span-2" disabled={!ready || add.isPending}>
        {add.isPending ? 'Adding…' : 'Add line'}
      </Button>
      {add.isError ? (
        <p role="alert" className="text-base font-bold text-fail sm:col-span-2">
          Not added: {errorText(add.error)}
        </p>
      ) : null}
    </form>
  );
}
