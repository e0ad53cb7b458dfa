import { useState } from 'react';
import type { Customer } from '../../../../shared/api/customers';
import { Button } from '../../../components/ui/button';
import { FactList } from '../../../components/ui/fact-list';
import type { Fact } from '../../../components/ui/fact-list';
import { Panel } from '../../../components/ui/panel';
import { CustomerForm } from './customer-form';

type CustomerRecordProps = {
  customer: Customer;
  /** The policy lets this role change customers (shared/api/policy.ts). */
  canEdit: boolean;
};

/** A customer's contact details, with an edit form in their place for the workshop. */
export function CustomerRecord({ customer, canEdit }: CustomerRecordProps) {
  const [editing, setEditing] = useState(false);
  const [savedNote, setSavedNote] = useState(false);
  if (editing) {
    return (
      <Panel>
        <h2 className="mb-4 text-xl font-bold">Edit contact details</h2>
        <CustomerForm
          mode="edit"
          customer={customer}
          onSaved={() => {
            setEditing(false);
            setSavedNote(true);
          }}
          onCancel={() => setEditing(false)}
        />
      </Panel>
    );
  }
  const address = [...customer.addressLines, customer.town].filter(Boolean);
  const facts: Fact[] = [
    {
      term: 'Phone',
      value: customer.phone ? (
        <a href={`tel:${customer.phone}`} className="underline underline-offset-4">
          {customer.phone}
        </a>
      ) : (
        <span className="text-ink-soft">none recorded</span>
      ),
    },
    {
      term: 'E-mail',
      value: customer.email ? (
        <span className="break-all">{customer.email}</span>
      ) : (
        <span className="text-ink-soft">none recorded: reminders and invoices cannot be mailed</span>
      ),
    },
    {
      term: 'Address',
      value:
        address.length > 0 ? (
          address.map((line) => (
            <span key={line} className="block">
              {line}
            </span>
          ))
        ) : (
          <span className="text-ink-soft">none recorded</span>
        ),
    },
    ...(customer.notes ? [{ term: 'Workshop notes', value: customer.notes }] : []),
  ];
  return (
    <Panel>
      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-xl font-bold">Contact details</h2>
        {canEdit ? (
          <Button
            variant="secondary"
            onClick={() => {
              setSavedNote(false);
              setEditing(true);
            }}
          >
            Edit contact details
          </Button>
        ) : null}
      </div>
      <FactList facts={facts} />
      <p role="status" className="mt-3 text-base font-bold text-pass">
        {savedNote ? 'Contact details saved.' : ''}
      </p>
    </Panel>
  );
}
