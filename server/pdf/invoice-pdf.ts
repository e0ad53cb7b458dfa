/**
 * The invoice as a PDF page set: pdfkit, Space Grotesk, Vanbay's daylight swatches. Everything it
 * prints comes from the stored invoice (InvoiceDocument); no money is figured here, only formatted,
 * from integer cents, once.
 */
import type { InvoiceStatus, PaymentMethod, TaxRounding } from '../../shared/api/invoices';
import type { LineItemKind } from '../../shared/api/jobs';
import type { MeterUnit } from '../../shared/api/machines';
import { round } from '../../shared/evaluators/types';
import { COLOUR, SheetLayout, type Paper } from './sheet';

export type { Paper } from './sheet';

export interface InvoiceDocument {
  business: {
    name: string;
    ownerName: string;
    addressLines: string[];
    phone: string | null;
    email: string;
    currency: string;
    invoiceTermsDays: number;
    invoiceFooter: string | null;
  };
  invoice: {
    number: number;
    status: InvoiceStatus;
    /** YYYY-MM-DD on the business's calendar. */
    issuedOn: string;
    dueOn: string;
    subtotalCents: number;
    taxCents: number;
    totalCents: number;
    paidCents: number;
    balanceCents: number;
    taxRatePpm: number;
    taxRounding: TaxRounding;
    terms: string | null;
    overdue: boolean;
    daysOverdue: number;
    paymentLinkUrl: string | null;
  };
  customer: { name: string; addressLines: string[]; town: string | null; email: string | null };
  machine: {
    year: number | null;
    make: string;
    model: string;
    vin: string | null;
    otherId: string | null;
    meterUnit: MeterUnit;
  };
  job: { meterReading: number | null; complaint: string; workDone: string | null };
  lines: {
    kind: LineItemKind;
    description: string;
    quantityMilli: number;
    unitPriceCents: number;
    lineTotalCents: number;
  }[];
  payments: { receivedOn: string; method: PaymentMethod; amountCents: number; reference: string | null }[];
  /** When the document was made: its PDF creation date, so the same input gives the same bytes. */
  generatedAt: Date;
}

const STATUS_WORDS: Record<InvoiceStatus, string> = {
  draft: 'Draft',
  issued: 'Awaiting payment',
  part_paid: 'Part paid',
  paid: 'Paid in full',
  void: 'Void',
};

const METHOD_WORDS: Record<PaymentMethod, string> = {
  card: 'Card',
  cash: 'Cash',
  cheque: 'Cheque',
  transfer: 'Bank transfer',
};

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** Thousands separators on a whole number given as digits. */
function groupDigits(digits: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

/**
 * Integer cents as money, by integer arithmetic only (no float ever touches the amount):
 * 123456 → "$1,234.56", −1000 → "−$10.00". Other currencies are written with their ISO 4217 code.
 */
export function formatCents(cents: number, currency = 'USD'): string {
  if (!Number.isSafeInteger(cents)) throw new RangeError(`money must be whole cents, not ${cents}`);
  const abs = Math.abs(cents);
  const whole = groupDigits(String(Math.trunc(abs / 100)));
  const fraction = String(abs % 100).padStart(2, '0');
  const symbol = currency === 'USD' ? '$' : `${currency} `;
  return `${cents < 0 ? '−' : ''}${symbol}${whole}.${fraction}`;
}

/** Thousandths as a plain number, trailing zeros dropped: 1500 → "1.5", 1000 → "1", 250 → "0.25". */
export function formatQuantity(quantityMilli: number): string {
  const abs = Math.abs(quantityMilli);
  const fraction = String(abs % 1000)
    .padStart(3, '0')
    .replace(/0+$/, '');
  const whole = groupDigits(String(Math.trunc(abs / 1000)));
  return `${quantityMilli < 0 ? '−' : ''}${whole}${fraction ? `.${fraction}` : ''}`;
}

/** A rate in parts per million as a percent: 62500 → "6.25 %", 88750 → "8.875 %". */
export function formatRatePpm(ratePpm: number): string {
  const fraction = String(ratePpm % 10_000)
    .padStart(4, '0')
    .replace(/0+$/, '');
  return `${Math.trunc(ratePpm / 10_000)}${fraction ? `.${fraction}` : ''} %`;
}

/** YYYY-MM-DD as "18 Nov 2026": day-month-year with the month named reads one way everywhere. */
export function formatDay(day: string): string {
  const [year, month, date] = day.split('-').map(Number);
  return `${date} ${MONTHS[(month ?? 1) - 1] ?? ''} ${year}`;
}

/** Invoice numbers printed with at least four digits: 42 → "0042". */
export function invoiceNumberLabel(number: number): string {
  return String(number).padStart(4, '0');
}

/** The sentence that names how the tax was rounded, as SSUTA §324 asks the seller to state. */
export function taxRoundingRule(rounding: TaxRounding): string {
  return `Tax rounded half up ${rounding === 'per_line' ? 'per line' : 'per invoice'} (SSUTA §324)`;
}

function machineTitle(machine: InvoiceDocument['machine']): string {
  return [machine.year, machine.make, machine.model].filter((part) => part !== null && part !== '').join(' ');
}

function machineIdentity(machine: InvoiceDocument['machine']): string {
  if (machine.vin) return `VIN ${machine.vin}`;
  if (machine.otherId) return `Serial ${machine.otherId}`;
  return 'No VIN or serial on file';
}

function meterLine(job: InvoiceDocument['job'], unit: MeterUnit): string {
  if (job.meterReading === null) return 'Meter not recorded at this visit';
  // Meters are read to a tenth; more places would be noise from the float column.
  const [whole = '0', fraction] = String(round(job.meterReading, 1)).split('.');
  const reading = `${groupDigits(whole)}${fraction ? `.${fraction}` : ''}`;
  return `Meter at this visit: ${reading} ${unit}`;
}

/** A line bills more than quantity × unit price when a parts markup is in its total. */
function includesMarkup(line: InvoiceDocument['lines'][number]): boolean {
  return line.quantityMilli * line.unitPriceCents !== line.lineTotalCents * 1000;
}

interface Columns {
  description: { x: number; width: number };
  quantity: { x: number; width: number };
  unitPrice: { x: number; width: number };
  amount: { x: number; width: number };
}

/** Draws one invoice; the class holds the cursor and the page geometry while it does. */
class InvoiceLayout extends SheetLayout {
  private readonly columns: Columns;

  constructor(
    private readonly data: InvoiceDocument,
    paper: Paper,
  ) {
    super(paper, {
      title: `Invoice ${invoiceNumberLabel(data.invoice.number)}`,
      author: data.business.name,
      subject: `Invoice for ${data.customer.name}`,
      generatedAt: data.generatedAt,
      business: data.business.name,
      continued: `Invoice ${invoiceNumberLabel(data.invoice.number)} (continued)`,
      footer: data.business.invoiceFooter,
    });
    const amountWidth = 86;
    const unitWidth = 84;
    const quantityWidth = 56;
    const right = this.left + this.width;
    this.columns = {
      amount: { x: right - amountWidth, width: amountWidth },
      unitPrice: { x: right - amountWidth - unitWidth, width: unitWidth },
      quantity: { x: right - amountWidth - unitWidth - quantityWidth, width: quantityWidth },
      description: { x: this.left, width: this.width - amountWidth - unitWidth - quantityWidth - 12 },
    };
  }

  protected draw(): void {
    this.header();
    this.parties();
    this.jobSummary();
    this.lineTable();
    this.settlement();
    this.terms();
  }

  private money(cents: number): string {
    return formatCents(cents, this.data.business.currency);
  }

  private header(): void {
    const { business, invoice } = this.data;
    const rightWidth = 200;
    const leftWidth = this.width - rightWidth - 24;
    const top = this.y;

    this.font(true, 17).text(business.name, this.left, top, { width: leftWidth });
    const contact = [
      business.ownerName,
      ...business.addressLines,
      [business.phone, business.email].filter(Boolean).join('  ·  '),
    ].filter((line) => line !== '');
    this.font(false, 9.5, COLOUR.soft).text(contact.join('\n'), this.left, this.doc.y + 3, {
      width: leftWidth,
      lineGap: 1.5,
    });
    const leftBottom = this.doc.y;

    const x = this.left + this.width - rightWidth;
    this.font(true, 26).text('Invoice', x, top - 5, { width: rightWidth, align: 'right' });
    this.font(true, 12, COLOUR.coolant).text(`No. ${invoiceNumberLabel(invoice.number)}`, x, this.doc.y, {
      width: rightWidth,
      align: 'right',
    });
    let y = this.doc.y + 8;
    const facts: [string, string][] = [
      ['Issued', formatDay(invoice.issuedOn)],
      ['Due', formatDay(invoice.dueOn)],
      ['Status', STATUS_WORDS[invoice.status]],
    ];
    for (const [name, value] of facts) {
      this.font(false, 9.5, COLOUR.soft).text(name, x + 60, y, { width: rightWidth - 60 });
      this.font(true, 9.5).text(value, x, y, { width: rightWidth, align: 'right' });
      y = this.doc.y + 2;
    }
    if (invoice.overdue) {
      const days = invoice.daysOverdue === 1 ? '1 day' : `${invoice.daysOverdue} days`;
      this.font(true, 9.5, COLOUR.fail).text(`Overdue: ${days} past the due date`, x, y + 2, {
        width: rightWidth,
        align: 'right',
      });
      y = this.doc.y;
    }
    this.y = Math.max(leftBottom, y) + 14;
    this.doc.rect(this.left, this.y, this.width, 2.5).fill(COLOUR.coolant);
    this.y += 16;
  }

  private parties(): void {
    const { customer, machine, job, invoice } = this.data;
    const stamp = invoice.status === 'paid' ? 'PAID' : invoice.status === 'void' ? 'VOID' : null;
    const gap = 20;
    const stampWidth = stamp ? 118 : 0;
    const columnWidth = (this.width - stampWidth - gap * (stamp ? 2 : 1)) / 2;
    const top = this.y;

    let y = this.label('Billed to', this.left, top, columnWidth);
    this.font(true, 10.5).text(customer.name, this.left, y, { width: columnWidth });
    const address = [...customer.addressLines];
    if (customer.town && !address.includes(customer.town)) address.push(customer.town);
    if (customer.email) address.push(customer.email);
    this.font(false, 9.5, COLOUR.soft).text(address.join('\n'), this.left, this.doc.y + 2, {
      width: columnWidth,
      lineGap: 1.5,
    });
    const customerBottom = this.doc.y;

    const mx = this.left + columnWidth + gap;
    y = this.label('Machine', mx, top, columnWidth);
    this.font(true, 10.5).text(machineTitle(machine), mx, y, { width: columnWidth });
    this.font(false, 9.5, COLOUR.soft).text(
      [machineIdentity(machine), meterLine(job, machine.meterUnit)].join('\n'),
      mx,
      this.doc.y + 2,
      { width: columnWidth, lineGap: 1.5 },
    );
    const machineBottom = this.doc.y;

    if (stamp) this.stamp(stamp, this.left + this.width - stampWidth, top + 4, stampWidth);
    this.y = Math.max(customerBottom, machineBottom, stamp ? top + 64 : 0) + 16;
  }

  /** PAID or VOID across its box, turned a little, in the verdict colour it means. */
  private stamp(word: 'PAID' | 'VOID', x: number, y: number, width: number): void {
    const colour = word === 'PAID' ? COLOUR.pass : COLOUR.fail;
    const height = 46;
    this.doc.save();
    this.doc.rotate(-8, { origin: [x + width / 2, y + height / 2] });
    this.doc.roundedRect(x, y, width, height, 5).lineWidth(3).strokeColor(colour).stroke();
    this.font(true, 26, colour).text(word, x, y + 8, { width, align: 'center', characterSpacing: 4 });
    this.doc.restore();
  }

  private jobSummary(): void {
    const { job } = this.data;
    const labelWidth = 70;
    const textWidth = this.width - labelWidth;
    this.font(false, 9.5);
    // Two lines at most for each: the invoice names the work; the job record holds the whole story.
    const twoLines = this.doc.currentLineHeight(true) * 2 + 2;
    const rows: [string, string][] = [['Complaint', job.complaint]];
    if (job.workDone) rows.push(['Work done', job.workDone]);
    let y = this.label('The job', this.left, this.y, this.width);
    for (const [name, text] of rows) {
      this.font(true, 9.5, COLOUR.soft).text(name, this.left, y, { width: labelWidth });
      this.font(false, 9.5).text(text, this.left + labelWidth, y, {
        width: textWidth,
        height: twoLines,
        ellipsis: '…',
      });
      y = Math.max(this.doc.y, y + 12) + 3;
    }
    this.y = y + 14;
  }

  private tableHeader(): void {
    const { description, quantity, unitPrice, amount } = this.columns;
    const height = 20;
    this.doc.rect(this.left, this.y, this.width, height).fill(COLOUR.ground);
    const y = this.y + 6;
    this.font(true, 8.5);
    this.doc.text('Description', description.x + 6, y, { width: description.width - 6 });
    this.doc.text('Qty', quantity.x, y, { width: quantity.width, align: 'right' });
    this.doc.text('Unit price', unitPrice.x, y, { width: unitPrice.width, align: 'right' });
    this.doc.text('Amount', amount.x, y, { width: amount.width - 6, align: 'right' });
    this.y += height;
    this.rule(this.y, COLOUR.ink, 0.75);
    this.y += 1;
  }

  /**
   * The lines, each measured before it is drawn: a row that would cross the footer goes whole to a
   * new page under the repeated table header, so no line item is ever split between pages.
   */
  private lineTable(): void {
    const { description, quantity, unitPrice, amount } = this.columns;
    const pad = 6;
    this.ensureRoom(20 + 30);
    this.tableHeader();
    for (const line of this.data.lines) {
      this.font(false, 9.5);
      const textHeight = this.doc.heightOfString(line.description, { width: description.width - 6 });
      const rowHeight = Math.max(textHeight, this.doc.currentLineHeight()) + pad * 2;
      if (this.ensureRoom(rowHeight)) this.tableHeader();
      const y = this.y + pad;
      this.font(false, 9.5).text(line.description, description.x + 6, y, { width: description.width - 6 });
      const unit = line.kind === 'labour' ? ' h' : '';
      this.doc.text(`${formatQuantity(line.quantityMilli)}${unit}`, quantity.x, y, {
        width: quantity.width,
        align: 'right',
      });
      this.doc.text(`${this.money(line.unitPriceCents)}${includesMarkup(line) ? '*' : ''}`, unitPrice.x, y, {
        width: unitPrice.width,
        align: 'right',
      });
      this.font(true, 9.5).text(this.money(line.lineTotalCents), amount.x, y, {
        width: amount.width - 6,
        align: 'right',
      });
      this.y += rowHeight;
      this.rule(this.y, COLOUR.rule, 0.5);
    }
    this.y += 6;
    if (this.data.lines.some(includesMarkup)) {
      this.ensureRoom(14);
      this.font(false, 8, COLOUR.soft).text(
        '* Unit price before the parts markup; the amount includes it.',
        this.left + 6,
        this.y,
        { width: this.width - 12 },
      );
      this.y = this.doc.y + 4;
    }
    this.y += 10;
  }

  /** Totals on the right, payments received on the left, kept together on one page. */
  private settlement(): void {
    const totalsWidth = 236;
    const gap = 28;
    const paymentsWidth = this.width - totalsWidth - gap;
    const totalsHeight = 128;
    const paymentsHeight = 30 + Math.max(1, this.data.payments.length) * 15;
    this.ensureRoom(Math.max(totalsHeight, paymentsHeight));
    const top = this.y;
    this.payments(this.left, top, paymentsWidth);
    const paymentsBottom = this.doc.y;
    this.totals(this.left + this.width - totalsWidth, top, totalsWidth);
    this.y = Math.max(this.y, paymentsBottom) + 22;
  }

  private totals(x: number, top: number, width: number): void {
    const { invoice } = this.data;
    let y = top;
    const row = (name: string, value: string, bold = false, size = 9.5) => {
      this.font(bold, size, bold ? COLOUR.ink : COLOUR.soft).text(name, x, y, { width: width - 100 });
      this.font(bold, size).text(value, x + width - 110, y, { width: 110 - 6, align: 'right' });
      y = this.doc.y + 4;
    };
    row('Subtotal', this.money(invoice.subtotalCents));
    row(`Sales tax ${formatRatePpm(invoice.taxRatePpm)}`, this.money(invoice.taxCents));
    this.font(false, 7.5, COLOUR.soft).text(taxRoundingRule(invoice.taxRounding), x, y - 3, { width });
    y = this.doc.y + 5;
    this.rule(y, COLOUR.ink, 0.75, x, width);
    y += 6;
    row('Total', this.money(invoice.totalCents), true, 12);
    row('Paid to date', this.money(invoice.paidCents));
    y += 2;
    const bandHeight = 28;
    const void_ = invoice.status === 'void';
    this.doc.rect(x, y, width, bandHeight).fill(void_ ? COLOUR.ground : COLOUR.coolant);
    const colour = void_ ? COLOUR.fail : COLOUR.onCoolant;
    this.font(true, 11, colour).text(void_ ? 'Void: nothing to pay' : 'Balance due', x + 8, y + 8, {
      width: width - 16,
    });
    if (!void_) {
      this.font(true, 12, colour).text(this.money(invoice.balanceCents), x + 8, y + 7.5, {
        width: width - 14,
        align: 'right',
      });
    }
    this.y = y + bandHeight;
  }

  private payments(x: number, top: number, width: number): void {
    const { payments, business } = this.data;
    let y = this.label('Payments received', x, top, width);
    this.rule(y, COLOUR.rule, 0.5, x, width);
    y += 5;
    if (payments.length === 0) {
      this.font(false, 9.5, COLOUR.soft).text('None yet.', x, y, { width });
      return;
    }
    for (const payment of payments) {
      const method = `${METHOD_WORDS[payment.method]}${payment.amountCents < 0 ? ' refund' : ''}`;
      // A reference that already names its method ("Cheque 1001") stands alone.
      const reference = payment.reference ?? '';
      const what = !reference
        ? method
        : reference.toLowerCase().startsWith(METHOD_WORDS[payment.method].toLowerCase())
          ? `${reference}${payment.amountCents < 0 ? ' refund' : ''}`
          : `${method}, ${reference}`;
      this.font(false, 9.5, COLOUR.soft).text(formatDay(payment.receivedOn), x, y, { width: 76 });
      this.font(false, 9.5).text(what, x + 78, y, {
        width: width - 78 - 90,
        height: this.doc.currentLineHeight(),
        ellipsis: '…',
      });
      this.font(true, 9.5).text(formatCents(payment.amountCents, business.currency), x + width - 84, y, {
        width: 84,
        align: 'right',
      });
      y = this.doc.y + 3;
    }
  }

  private terms(): void {
    const { business, invoice } = this.data;
    const text = [
      `Net ${business.invoiceTermsDays} days from the issue date: due by ${formatDay(invoice.dueOn)}.`,
      invoice.terms,
    ]
      .filter(Boolean)
      .join(' ');
    this.font(false, 9.5);
    const height =
      14 + this.doc.heightOfString(text, { width: this.width }) + (invoice.paymentLinkUrl ? 16 : 0);
    this.ensureRoom(height);
    const y = this.label('Terms', this.left, this.y, this.width);
    this.font(false, 9.5).text(text, this.left, y, { width: this.width });
    if (invoice.paymentLinkUrl) {
      this.font(false, 9.5, COLOUR.soft).text('Pay by card online: ', this.left, this.doc.y + 4, {
        continued: true,
      });
      this.font(true, 9.5, COLOUR.coolant).text(invoice.paymentLinkUrl, {
        link: invoice.paymentLinkUrl,
        underline: true,
      });
    }
    this.y = this.doc.y;
  }

}

/** Renders an invoice to PDF bytes on Letter or A4 paper. */
export function renderInvoicePdf(data: InvoiceDocument, paper: Paper): Promise<Buffer> {
  return new InvoiceLayout(data, paper).render();
}
