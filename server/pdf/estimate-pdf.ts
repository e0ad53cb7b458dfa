/**
 * The estimate as a PDF: the job's lines as quoted, the totals shared/money.ts figured when it was
 * made, and the customer's answer once given. Same type, swatches and sheets as the invoice; no
 * money is figured here, only formatted from integer cents.
 */
import type { EstimateDecidedVia, EstimateLine } from '../../shared/api/estimates';
import type { TaxRounding } from '../../shared/api/invoices';
import type { MeterUnit } from '../../shared/api/machines';
import { formatCents, formatQuantity, formatRatePpm, taxRoundingRule } from './invoice-pdf';
import { COLOUR, SheetLayout, type Paper } from './sheet';

export interface EstimateDocument {
  business: {
    name: string;
    ownerName: string;
    addressLines: string[];
    phone: string | null;
    email: string;
    currency: string;
  };
  estimate: {
    id: number;
    status: 'draft' | 'sent' | 'approved' | 'declined';
    /** "18 Nov 2026" on the business's calendar. */
    issuedOn: string;
    subtotalCents: number | null;
    taxCents: number | null;
    totalCents: number;
    taxRatePpm: number | null;
    taxRounding: TaxRounding | null;
    note: string | null;
    decision: {
      on: string;
      by: string | null;
      via: EstimateDecidedVia | null;
      note: string | null;
    } | null;
  };
  customer: { name: string; email: string | null };
  machine: { title: string; identity: string; meterUnit: MeterUnit };
  job: { id: number; complaint: string; diagnosis: string | null };
  lines: EstimateLine[];
  generatedAt: Date;
}

const STATUS_WORDS = {
  draft: 'Draft',
  sent: 'Waiting for your answer',
  approved: 'Approved',
  declined: 'Declined',
} as const;

/** What the customer is asked to do, printed under the totals while the estimate is open. */
export const ESTIMATE_TERMS =
  'This estimate is based on the diagnosis so far. Work starts once you approve it: approve or decline it ' +
  'when you sign in to see your job, or reply to the e-mail it came with. If the work turns up something ' +
  'more, you get a new estimate before anything beyond this one is done.';

class EstimateLayout extends SheetLayout {

  constructor(
    private readonly data: EstimateDocument,
    paper: Paper,
  ) {
    super(paper, {
      title: `Estimate ${data.estimate.id}`,
      author: data.business.name,
      subject: `Estimate for ${data.customer.name}`,
      generatedAt: data.generatedAt,
      business: data.business.name,
      continued: `Estimate ${data.estimate.id} (continued)`,
      footer: `${data.business.name} · estimate ${data.estimate.id}`,
    });
  }

  protected draw(): void {
    this.header();
    this.parties();
    this.lineTable();
    this.totals();
    this.closing();
  }

  private money(cents: number): string {
    return formatCents(cents, this.data.business.currency);
  }

  private header(): void {
    const { business, estimate, job } = this.data;
    const rightWidth = 210;
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
    this.font(true, 26).text('Estimate', x, top - 5, { width: rightWidth, align: 'right' });
    this.font(true, 12, COLOUR.coolant).text(`No. ${estimate.id} · job ${job.id}`, x, this.doc.y, {
      width: rightWidth,
      align: 'right',
    });
    let y = this.doc.y + 8;
    for (const [name, value] of [
      ['Issued', estimate.issuedOn],
      ['Status', STATUS_WORDS[estimate.status]],
    ] as const) {
      this.font(false, 9.5, COLOUR.soft).text(name, x + 60, y, { width: rightWidth - 60 });
      this.font(true, 9.5).text(value, x, y, { width: rightWidth, align: 'right' });
      y = this.doc.y + 2;
    }
    this.y = Math.max(leftBottom, y) + 14;
    this.doc.rect(this.left, this.y, this.width, 2.5).fill(COLOUR.coolant);
    this.y += 16;
  }

  private parties(): void {
    const { customer, machine, job } = this.data;
    const gap = 20;
    const columnWidth = (this.width - gap) / 2;
    const top = this.y;
    let y = this.label('Prepared for', this.left, top, columnWidth);
    this.font(true, 10.5).text(customer.name, this.left, y, { width: columnWidth });
    if (customer.email) {
      this.font(false, 9.5, COLOUR.soft).text(customer.email, this.left, this.doc.y + 2, {
        width: columnWidth,
      });
    }
    const customerBottom = this.doc.y;
    const mx = this.left + columnWidth + gap;
    y = this.label('Machine', mx, top, columnWidth);
    this.font(true, 10.5).text(machine.title, mx, y, { width: columnWidth });
    this.font(false, 9.5, COLOUR.soft).text(machine.identity, mx, this.doc.y + 2, { width: columnWidth });
    this.y = Math.max(customerBottom, this.doc.y) + 14;
    const rows: [string, string][] = [['Complaint', job.complaint]];
    if (job.diagnosis) rows.push(['Diagnosis', job.diagnosis]);
    if (this.data.estimate.note) rows.push(['A word from us', this.data.estimate.note]);
    for (const [name, text] of rows) {
      this.font(false, 9.5);
      const height = this.doc.heightOfString(text, { width: this.width - 90 });
      this.ensureRoom(height + 4);
      this.font(true, 9.5, COLOUR.soft).text(name, this.left, this.y, { width: 86 });
      this.font(false, 9.5).text(text, this.left + 90, this.y, { width: this.width - 90 });
      this.y = Math.max(this.doc.y, this.y + 12) + 3;
    }
    this.y += 12;
  }

  private tableHeader(columns: { quantity: number; unit: number; amount: number }): void {
    const height = 20;
    this.doc.rect(this.left, this.y, this.width, height).fill(COLOUR.ground);
    const y = this.y + 6;
    const right = this.left + this.width;
    this.font(true, 8.5);
    this.doc.text('Description', this.left + 6, y, { width: 200 });
    this.doc.text('Qty', right - columns.amount - columns.unit - columns.quantity, y, {
      width: columns.quantity,
      align: 'right',
    });
    this.doc.text('Unit price', right - columns.amount - columns.unit, y, {
      width: columns.unit,
      align: 'right',
    });
    this.doc.text('Amount', right - columns.amount, y, { width: columns.amount - 6, align: 'right' });
    this.y += height;
    this.rule(this.y, COLOUR.ink, 0.75);
    this.y += 1;
  }

  private lineTable(): void {
    const columns = { quantity: 56, unit: 84, amount: 86 };
    const right = this.left + this.width;
    const descriptionWidth = this.width - columns.quantity - columns.unit - columns.amount - 18;
    this.ensureRoom(50);
    this.tableHeader(columns);
    for (const line of this.data.lines) {
      this.font(false, 9.5);
      const rowHeight = this.doc.heightOfString(line.description, { width: descriptionWidth }) + 12;
      if (this.ensureRoom(rowHeight)) this.tableHeader(columns);
      const y = this.y + 6;
      this.font(false, 9.5).text(line.description, this.left + 6, y, { width: descriptionWidth });
      const unit = line.kind === 'labour' ? ' h' : '';
      this.doc.text(
        `${formatQuantity(line.quantityMilli)}${unit}`,
        right - columns.amount - columns.unit - columns.quantity,
        y,
        { width: columns.quantity, align: 'right' },
      );
      this.doc.text(this.money(line.unitPriceCents), right - columns.amount - columns.unit, y, {
        width: columns.unit,
        align: 'right',
      });
      if (line.lineTotalCents !== null) {
        this.font(true, 9.5).text(this.money(line.lineTotalCents), right - columns.amount, y, {
          width: columns.amount - 6,
          align: 'right',
        });
      }
      this.y += rowHeight;
      this.rule(this.y, COLOUR.rule, 0.5);
    }
    if (this.data.lines.some((line) => (line.markupBps ?? 0) > 0)) {
      this.y += 4;
      this.font(false, 8, COLOUR.soft).text(
        'Unit prices are before the parts markup; the amounts include it.',
        this.left + 6,
        this.y,
        { width: this.width - 12 },
      );
      this.y = this.doc.y;
    }
    this.y += 14;
  }

  private totals(): void {
    const { estimate } = this.data;
    const width = 236;
    const x = this.left + this.width - width;
    this.ensureRoom(110);
    let y = this.y;
    const row = (name: string, value: string, bold = false, size = 9.5) => {
      this.font(bold, size, bold ? COLOUR.ink : COLOUR.soft).text(name, x, y, { width: width - 100 });
      this.font(bold, size).text(value, x + width - 110, y, { width: 104, align: 'right' });
      y = this.doc.y + 4;
    };
    if (estimate.subtotalCents !== null) row('Subtotal', this.money(estimate.subtotalCents));
    if (estimate.taxCents !== null && estimate.taxRatePpm !== null) {
      row(`Sales tax ${formatRatePpm(estimate.taxRatePpm)}`, this.money(estimate.taxCents));
    }
    if (estimate.taxRounding) {
      this.font(false, 7.5, COLOUR.soft).text(taxRoundingRule(estimate.taxRounding), x, y - 3, { width });
      y = this.doc.y + 5;
    }
    this.rule(y, COLOUR.ink, 0.75, x, width);
    y += 6;
    const bandHeight = 28;
    this.doc.rect(x, y, width, bandHeight).fill(COLOUR.coolant);
    this.font(true, 11, COLOUR.onCoolant).text('Estimated total', x + 8, y + 8, { width: width - 16 });
    this.font(true, 12, COLOUR.onCoolant).text(this.money(estimate.totalCents), x + 8, y + 7.5, {
      width: width - 14,
      align: 'right',
    });
    this.y = y + bandHeight + 18;
  }

  private closing(): void {
    const { decision } = this.data.estimate;
    if (decision) {
      const approved = this.data.estimate.status === 'approved';
      const who = decision.by ?? 'the customer';
      const via =
        decision.via === 'owner_for_customer'
          ? `, recorded by ${who} on the customer's word${decision.note ? ` (${decision.note})` : ''}`
          : ` by ${who}${decision.note ? `: “${decision.note}”` : ''}`;
      const text = `${approved ? 'Approved' : 'Declined'} on ${decision.on}${via}.`;
      this.ensureRoom(40);
      this.font(true, 11, approved ? COLOUR.pass : COLOUR.fail).text(text, this.left, this.y, {
        width: this.width,
      });
      this.y = this.doc.y + 10;
      return;
    }
    this.font(false, 9.5);
    this.ensureRoom(this.doc.heightOfString(ESTIMATE_TERMS, { width: this.width }) + 20);
    const y = this.label('Your answer', this.left, this.y, this.width);
    this.font(false, 9.5).text(ESTIMATE_TERMS, this.left, y, { width: this.width });
    this.y = this.doc.y + 8;
  }

}

export function renderEstimatePdf(data: EstimateDocument, paper: Paper): Promise<Buffer> {
  return new EstimateLayout(data, paper).render();
}
