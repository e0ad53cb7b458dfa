import { Link } from 'react-router';
import { INVOICE_VIEWS } from './invoice-list';
import type { InvoiceView } from './invoice-list';

// Current is inverted and bold, not only recoloured, so it still shows on a glare-washed screen.
const base = 'flex min-h-touch items-center rounded-plate border-2 px-4 text-base';
const idle = 'border-ink font-medium';
const current = 'border-ink bg-ink font-bold text-ground';

/** Which invoices the list shows; each view is its own address (`?show=`), so it can be bookmarked. */
export function InvoiceViews({ view }: { view: InvoiceView }) {
  return (
    <nav aria-label="Which invoices">
      <ul className="flex flex-wrap gap-2">
        {Object.entries(INVOICE_VIEWS).map(([key, { label }]) => (
          <li key={key}>
            <Link
              to={key === 'all' ? '?' : `?show=${key}`}
              aria-current={key === view ? 'page' : undefined}
              className={`${base} ${key === view ? current : idle}`}
            >
              {label}
            </Link>
          </li>
        ))}
      </ul>
    </nav>
  );
}
