/**
 * The customer's diagnostic report as a PDF: what was measured, against which limit, what each
 * verdict means in plain words, the pressure-hold chart, the findings, the work done, and the
 * safety and service-manual notes (PRODUCT.md, "Customer diagnostic report"). Same type, swatches
 * and sheet sizes as the invoice; everything it prints comes ready-worded from ReportDocument
 * (server/services/report-documents.ts), except the chart, which is drawn here from its numbers.
 */
import type { LineItemKind } from '../../shared/api/jobs';
import type { MeterUnit } from '../../shared/api/machines';
import type { Verdict } from '../../shared/api/readings';
import type { SpecSource } from '../../shared/evaluators/types';
import { round } from '../../shared/evaluators/types';
import { formatQuantity } from './invoice-pdf';
import { COLOUR as SHEET_COLOUR, SheetLayout, type Paper } from './sheet';

/** The words every generic limit carries wherever it is shown (DEVELOPERS.md, "Data rules"). */
export const GENERIC_LABEL = 'generic — confirm in the service manual';
export const MANUAL_LABEL = "from this machine's service manual";

export interface ReportLimit {
  label: string;
  /** The limit in the mechanic's unit, with the stored unit beside it. */
  value: string;
  source: SpecSource;
}

export interface ReportStep {
  title: string;
  /** The answer in plain words, values in the unit the mechanic typed. */
  answer: string;
  verdict: Verdict | null;
  reason: string | null;
}

/** A static hold's series and its limit, in the unit the mechanic read the gauge in. */
export interface HoldChart {
  unitLabel: string;
  points: { sec: number; value: number }[];
  /** Seconds after the pump stops that are not judged (a small settling drop is normal). */
  settleSec: number;
  /** Where the judged hold ends: its length in seconds. */
  endSec: number;
  /** The first reading at or after the settling window (null when there was none to judge from). */
  start: { sec: number; value: number } | null;
  /** The largest fall allowed, in the chart's unit. */
  maxDrop: number;
  /** The lowest the pressure may fall to: the settled start less the allowed fall. */
  allowedLow: number | null;
  specSource: SpecSource;
  verdict: Verdict;
}

export interface ReportFinding {
  title: string;
  detail: string;
  nextAction: string;
  verdict: Verdict;
}

export interface ReportCheck {
  title: string;
  summary: string;
  /** "Finished", "Paused", "Not finished". */
  statusLabel: string;
  startedAt: string;
  verdict: Verdict | null;
  limits: ReportLimit[];
  steps: ReportStep[];
  holds: HoldChart[];
  findings: ReportFinding[];
  causes: { title: string; likelihood: string; evidence: string[] }[];
  nextAction: string | null;
  advice: string[];
  /** Set when the stored run no longer walks through its procedure: said, not hidden. */
  problem: string | null;
}

export interface ReportReading {
  takenAt: string;
  quantity: string;
  /** As the mechanic typed it: `43 psi`. */
  typed: string;
  /** The canonical value stored: `296.5 kPa`. */
  stored: string;
  takenIn: string;
}

export interface ReportDocument {
  business: {
    name: string;
    ownerName: string;
    addressLines: string[];
    phone: string | null;
    email: string;
  };
  job: {
    id: number;
    statusLabel: string;
    visitDay: string | null;
    location: string | null;
    complaint: string;
    diagnosis: string | null;
    workDone: string | null;
    meterReading: number | null;
  };
  customer: { name: string; email: string | null };
  machine: {
    year: number | null;
    make: string;
    model: string;
    vin: string | null;
    otherId: string | null;
    meterUnit: MeterUnit;
  };
  checks: ReportCheck[];
  readings: ReportReading[];
  work: { kind: LineItemKind; description: string; quantityMilli: number }[];
  cautions: { title: string; lines: string[] }[];
  /** The deferral to the manual, local codes and licensed practice (shared/procedures/cautions.ts). */
  deferLine: string;
  /** Day the report was made, "18 Nov 2026", on the business's calendar. */
  preparedOn: string;
  /** Its PDF creation date, so the same input gives the same bytes. */
  generatedAt: Date;
}

/** Vanbay's daylight swatches (tailwind.config.ts), as on the invoice. */
const COLOUR = {
  ...SHEET_COLOUR,
  grid: '#d6d2c8',
  passWash: '#dcf1e1',
  warn: '#6e4200',
  warnWash: '#fbedc6',
  failWash: '#f9dedb',
} as const;

/** The hold chart's own colours, exported so a test can find them on the rendered page. */
export const CHART_COLOUR = { series: COLOUR.coolant, limit: COLOUR.fail } as const;

/** Each verdict in the words a customer reads. */
export const VERDICT_WORDS: Record<Verdict, string> = {
  pass: 'Passed',
  warn: 'Needs attention',
  fail: 'Failed',
};
const NOTED = 'Noted';

const VERDICT_INK: Record<Verdict, string> = { pass: COLOUR.pass, warn: COLOUR.warn, fail: COLOUR.fail };
const VERDICT_WASH: Record<Verdict, string> = {
  pass: COLOUR.passWash,
  warn: COLOUR.warnWash,
  fail: COLOUR.failWash,
};

const KIND_WORDS: Record<LineItemKind, string> = {
  labour: 'Labour',
  part: 'Part',
  trip: 'Call-out',
  supplies: 'Supplies',
  other: 'Other',
};

/** The opening note: how limits are labelled and that the manual's figure wins. */
export const MANUAL_GOVERNS =
  "Each reading below is compared with a limit. Where this machine's service manual gives a figure and it was entered, " +
  `that figure is used and marked “${MANUAL_LABEL}”. Otherwise Vanbay's generic default is used and marked ` +
  `“${GENERIC_LABEL}”. The service manual's specification always governs.`;

function groupDigits(digits: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

function machineTitle(machine: ReportDocument['machine']): string {
  return [machine.year, machine.make, machine.model].filter((part) => part !== null && part !== '').join(' ');
}

function meterLine(reading: number | null, unit: MeterUnit): string {
  if (reading === null) return 'Meter not recorded at this visit';
  const [whole = '0', fraction] = String(round(reading, 1)).split('.');
  return `Meter at this visit: ${groupDigits(whole)}${fraction ? `.${fraction}` : ''} ${unit}`;
}

/**
 * "Nice" axis steps of 1, 2, 2.5 or 5 times a power of ten (P. Heckbert, "Nice numbers for graph
 * labels", Graphics Gems, 1990): the step nearest `range / count` from above.
 */
export function niceStep(range: number, count: number): number {
  const raw = range / Math.max(1, count);
  if (!(raw > 0) || !Number.isFinite(raw)) return 1;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const normal = raw / magnitude;
  const nice = normal <= 1 ? 1 : normal <= 2 ? 2 : normal <= 2.5 ? 2.5 : normal <= 5 ? 5 : 10;
  return nice * magnitude;
}

/** Time steps a gauge is read at: whole seconds and minutes, at most eight ticks on the axis. */
const TIME_STEPS = [5, 10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600];
function timeStep(span: number): number {
  return TIME_STEPS.find((step) => span / step <= 8) ?? Math.ceil(span / 8 / 3600) * 3600;
}

/** Decimals enough to tell ticks `step` apart: 0.5 → 1, 0.25 → 2, 2 → 0. */
function decimalsFor(step: number): number {
  for (let places = 0; places < 6; places += 1) {
    if (Math.abs(round(step, places) - step) < 1e-9) return places;
  }
  return 6;
}

/** Draws one report; the class holds the cursor and the page geometry while it does. */
class ReportLayout extends SheetLayout {

  constructor(
    private readonly data: ReportDocument,
    paper: Paper,
  ) {
    super(paper, {
      title: `Diagnostic report, job ${data.job.id}`,
      author: data.business.name,
      subject: `Diagnostic report for ${data.customer.name}`,
      generatedAt: data.generatedAt,
      business: data.business.name,
      continued: `Diagnostic report, job ${data.job.id} (continued)`,
      footer: `${data.business.name} · diagnostic report, job ${data.job.id}`,
    });
  }

  protected draw(): void {
    this.header();
    this.parties();
    this.jobSummary();
    this.manualNote();
    for (const check of this.data.checks) this.check(check);
    if (this.data.checks.length === 0) this.paragraph('No guided check was run on this visit.');
    this.readings();
    this.work();
    this.safety();
  }

  // ---- Primitives ----------------------------------------------------------------------------

  private textHeight(text: string, width: number, bold: boolean, size: number): number {
    this.font(bold, size);
    return this.doc.heightOfString(text, { width });
  }

  /** A section heading, kept on the page with at least `keep` points of what follows. */
  private heading(text: string, keep = 60): void {
    this.ensureRoom(28 + keep);
    this.y += 6;
    this.font(true, 13).text(text, this.left, this.y, { width: this.width });
    this.y = this.doc.y + 3;
    this.rule(this.y, COLOUR.ink, 0.75);
    this.y += 8;
  }

  private paragraph(text: string, size = 9.5, colour: string = COLOUR.ink, bold = false): void {
    const height = this.textHeight(text, this.width, bold, size);
    this.ensureRoom(height + 4);
    this.font(bold, size, colour).text(text, this.left, this.y, { width: this.width });
    this.y = this.doc.y + 6;
  }

  /** A verdict as a small coloured tag: the word on its wash, in its ink. */
  private verdictTag(verdict: Verdict | null, x: number, y: number, width: number, size = 8.5): void {
    const word = verdict ? VERDICT_WORDS[verdict] : NOTED;
    this.font(true, size);
    const tagWidth = Math.min(width, this.doc.widthOfString(word) + 12);
    const height = size + 7;
    if (verdict) {
      this.doc.roundedRect(x + width - tagWidth, y, tagWidth, height, 3).fill(VERDICT_WASH[verdict]);
    }
    this.font(true, size, verdict ? VERDICT_INK[verdict] : COLOUR.soft).text(
      word,
      x + width - tagWidth,
      y + 3.5,
      { width: tagWidth, align: 'center', lineBreak: false },
    );
  }

  // ---- Sections ------------------------------------------------------------------------------

  private header(): void {
    const { business, job } = this.data;
    const rightWidth = 220;
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
    this.font(true, 22).text('Diagnostic report', x, top - 3, { width: rightWidth, align: 'right' });
    this.font(true, 12, COLOUR.coolant).text(`Job ${job.id}`, x, this.doc.y, {
      width: rightWidth,
      align: 'right',
    });
    let y = this.doc.y + 8;
    const facts: [string, string][] = [
      ['Visit', job.visitDay ?? 'not yet'],
      ['Prepared', this.data.preparedOn],
      ['Job status', job.statusLabel],
    ];
    for (const [name, value] of facts) {
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
    this.font(true, 10.5).text(machineTitle(machine), mx, y, { width: columnWidth });
    const identity = machine.vin
      ? `VIN ${machine.vin}`
      : machine.otherId
        ? `Serial ${machine.otherId}`
        : 'No VIN or serial on file';
    this.font(false, 9.5, COLOUR.soft).text(
      [identity, meterLine(job.meterReading, machine.meterUnit)].join('\n'),
      mx,
      this.doc.y + 2,
      { width: columnWidth, lineGap: 1.5 },
    );
    this.y = Math.max(customerBottom, this.doc.y) + 16;
  }

  private jobSummary(): void {
    const { job } = this.data;
    const labelWidth = 84;
    const textWidth = this.width - labelWidth;
    const rows: [string, string][] = [['Complaint', job.complaint]];
    if (job.location) rows.push(['Where', job.location]);
    if (job.diagnosis) rows.push(['Diagnosis', job.diagnosis]);
    this.ensureRoom(40);
    this.y = this.label('The visit', this.left, this.y, this.width);
    for (const [name, text] of rows) {
      const height = this.textHeight(text, textWidth, false, 9.5);
      this.ensureRoom(height + 4);
      this.font(true, 9.5, COLOUR.soft).text(name, this.left, this.y, { width: labelWidth });
      this.font(false, 9.5).text(text, this.left + labelWidth, this.y, { width: textWidth });
      this.y = Math.max(this.doc.y, this.y + 12) + 3;
    }
    this.y += 8;
  }

  /** The note that the service manual's figure governs, before any verdict is read. */
  private manualNote(): void {
    const pad = 9;
    const textWidth = this.width - pad * 2 - 4;
    const height = this.textHeight(MANUAL_GOVERNS, textWidth, false, 9) + 14 + pad * 2;
    this.ensureRoom(height);
    this.doc.rect(this.left, this.y, this.width, height).fill(COLOUR.ground);
    this.doc.rect(this.left, this.y, 4, height).fill(COLOUR.coolant);
    this.font(true, 9.5).text('How to read this report', this.left + pad + 4, this.y + pad, {
      width: textWidth,
    });
    this.font(false, 9).text(MANUAL_GOVERNS, this.left + pad + 4, this.doc.y + 3, { width: textWidth });
    this.y += height + 10;
  }

  private check(check: ReportCheck): void {
    this.heading(check.title, 90);
    const top = this.y;
    this.font(false, 9, COLOUR.soft).text(
      `${check.summary} Started ${check.startedAt}; ${check.statusLabel.toLowerCase()}.`,
      this.left,
      top,
      { width: this.width - 170 },
    );
    this.font(true, 8, COLOUR.soft).text('OVERALL', this.left + this.width - 150, top + 3.5, {
      width: 50,
      characterSpacing: 0.8,
    });
    this.verdictTag(check.verdict, this.left + this.width - 100, top, 100, 9);
    this.y = Math.max(this.doc.y, top + 18) + 8;

    if (check.problem) this.paragraph(check.problem, 9.5, COLOUR.fail, true);
    this.limits(check.limits);
    this.steps(check.steps);
    for (const hold of check.holds) this.holdChart(hold);
    this.findings(check);
  }

  private limits(limits: ReportLimit[]): void {
    if (limits.length === 0) {
      this.paragraph(
        'No machine-specific limit applies to this check: each step was judged against the values Vanbay ships with, given in its reason below.',
        9,
        COLOUR.soft,
      );
      return;
    }
    const labelWidth = 170;
    const sourceWidth = 170;
    const valueWidth = this.width - labelWidth - sourceWidth - 16;
    this.ensureRoom(16 + 16 * limits.length);
    this.y = this.label('Judged against', this.left, this.y, this.width);
    for (const limit of limits) {
      const height = Math.max(
        this.textHeight(limit.label, labelWidth, false, 9),
        this.textHeight(limit.value, valueWidth, true, 9),
      );
      this.ensureRoom(height + 6);
      const y = this.y;
      this.font(false, 9, COLOUR.soft).text(limit.label, this.left, y, { width: labelWidth });
      this.font(true, 9).text(limit.value, this.left + labelWidth + 8, y, { width: valueWidth });
      const generic = limit.source === 'generic';
      this.font(generic, 9, generic ? COLOUR.warn : COLOUR.pass).text(
        generic ? GENERIC_LABEL : MANUAL_LABEL,
        this.left + this.width - sourceWidth,
        y,
        { width: sourceWidth, align: 'right' },
      );
      this.y = Math.max(this.doc.y, y + height) + 4;
    }
    this.y += 6;
  }

  private stepsHeader(columns: { step: number; found: number; verdict: number }): void {
    const height = 18;
    this.doc.rect(this.left, this.y, this.width, height).fill(COLOUR.ground);
    const y = this.y + 5;
    this.font(true, 8.5);
    this.doc.text('Step', this.left + 6, y, { width: columns.step - 6 });
    this.doc.text('What was found, and what it means', this.left + columns.step, y, { width: columns.found });
    this.doc.text('Verdict', this.left + this.width - columns.verdict, y, {
      width: columns.verdict - 6,
      align: 'right',
    });
    this.y += height;
    this.rule(this.y, COLOUR.ink, 0.75);
    this.y += 1;
  }

  /** Each step a row, measured first and never split between pages. */
  private steps(steps: ReportStep[]): void {
    if (steps.length === 0) return;
    const columns = { step: 132, verdict: 104, found: 0 };
    columns.found = this.width - columns.step - columns.verdict - 8;
    const pad = 5;
    this.ensureRoom(18 + 40);
    this.stepsHeader(columns);
    for (const step of steps) {
      const answerHeight = this.textHeight(step.answer, columns.found, false, 9);
      const reasonHeight = step.reason ? this.textHeight(step.reason, columns.found, false, 8.5) + 2 : 0;
      const titleHeight = this.textHeight(step.title, columns.step - 10, true, 9);
      const rowHeight = Math.max(answerHeight + reasonHeight, titleHeight, 16) + pad * 2;
      if (this.ensureRoom(rowHeight)) this.stepsHeader(columns);
      const y = this.y + pad;
      this.font(true, 9).text(step.title, this.left + 6, y, { width: columns.step - 10 });
      this.font(false, 9).text(step.answer, this.left + columns.step, y, { width: columns.found });
      if (step.reason) {
        this.font(false, 8.5, COLOUR.soft).text(step.reason, this.left + columns.step, this.doc.y + 2, {
          width: columns.found,
        });
      }
      this.verdictTag(step.verdict, this.left + this.width - columns.verdict, y - 1, columns.verdict - 4);
      this.y += rowHeight;
      this.rule(this.y, COLOUR.rule, 0.4);
    }
    this.y += 10;
  }

  /**
   * The static hold as a line chart: pressure over seconds since the pump stopped, in the unit the
   * gauge was read in; the settling window shaded (not judged); the lowest pressure the limit
   * allows drawn as a dashed line over the judged window; each reading a dot.
   */
  private holdChart(hold: HoldChart): void {
    const titleHeight = 30;
    const plotHeight = 150;
    const axisRoom = 30;
    const legendHeight = 28;
    this.ensureRoom(titleHeight + plotHeight + axisRoom + legendHeight + 10);
    const unit = hold.unitLabel;
    this.font(true, 10).text(
      `Pressure hold: ${unit} over seconds since the pump stopped`,
      this.left,
      this.y,
      {
        width: this.width,
      },
    );
    const top = this.y + titleHeight;
    const yLabelWidth = 44;
    const plot = {
      x: this.left + yLabelWidth,
      y: top,
      width: this.width - yLabelWidth - 12,
      height: plotHeight,
    };

    const values = hold.points.map((p) => p.value);
    if (hold.allowedLow !== null) values.push(hold.allowedLow);
    if (hold.start) values.push(hold.start.value);
    let low = values.length > 0 ? Math.min(...values) : 0;
    let high = values.length > 0 ? Math.max(...values) : 1;
    if (high - low < 1e-9) {
      low -= 1;
      high += 1;
    }
    const yStep = niceStep(high - low, 5);
    const yMin = Math.max(0, Math.floor(low / yStep - 0.25) * yStep);
    const yMax = Math.ceil(high / yStep + 0.25) * yStep;
    const lastSec = hold.points.at(-1)?.sec ?? 0;
    const xMaxRaw = Math.max(hold.endSec, lastSec, hold.settleSec * 2);
    const xStep = timeStep(xMaxRaw);
    const xMax = Math.ceil(xMaxRaw / xStep) * xStep;
    const px = (sec: number) => plot.x + (sec / xMax) * plot.width;
    const py = (value: number) => plot.y + plot.height - ((value - yMin) / (yMax - yMin)) * plot.height;

    // The settling window: shaded, since nothing in it is judged.
    this.doc
      .rect(plot.x, plot.y, px(Math.min(hold.settleSec, xMax)) - plot.x, plot.height)
      .fill(COLOUR.ground);
    this.font(false, 7.5, COLOUR.soft).text('settling', plot.x + 3, plot.y + 4, {
      width: px(hold.settleSec) - plot.x - 4,
      lineBreak: false,
    });

    // Grid and tick labels.
    const yDecimals = decimalsFor(yStep);
    for (let value = yMin; value <= yMax + yStep / 1000; value += yStep) {
      const y = py(value);
      this.doc
        .moveTo(plot.x, y)
        .lineTo(plot.x + plot.width, y)
        .lineWidth(0.5)
        .strokeColor(COLOUR.grid)
        .stroke();
      this.font(false, 8, COLOUR.soft).text(round(value, yDecimals).toFixed(yDecimals), this.left, y - 4, {
        width: yLabelWidth - 6,
        align: 'right',
        lineBreak: false,
      });
    }
    for (let sec = 0; sec <= xMax + 1e-9; sec += xStep) {
      const x = px(sec);
      this.doc
        .moveTo(x, plot.y)
        .lineTo(x, plot.y + plot.height)
        .lineWidth(0.5)
        .strokeColor(COLOUR.grid)
        .stroke();
      this.font(false, 8, COLOUR.soft).text(`${round(sec, 0)} s`, x - 24, plot.y + plot.height + 5, {
        width: 48,
        align: 'center',
        lineBreak: false,
      });
    }
    this.font(true, 8, COLOUR.soft).text(unit, this.left, plot.y - 14, {
      width: yLabelWidth - 6,
      align: 'right',
      lineBreak: false,
    });
    this.font(false, 8, COLOUR.soft).text(
      'seconds since the pump stopped',
      plot.x,
      plot.y + plot.height + 17,
      { width: plot.width, align: 'center', lineBreak: false },
    );

    // Axes.
    this.doc
      .moveTo(plot.x, plot.y)
      .lineTo(plot.x, plot.y + plot.height)
      .lineTo(plot.x + plot.width, plot.y + plot.height)
      .lineWidth(1)
      .strokeColor(COLOUR.ink)
      .stroke();

    // The end of the judged hold, when the readings run past it.
    if (hold.endSec < xMax) {
      const x = px(hold.endSec);
      this.doc
        .moveTo(x, plot.y)
        .lineTo(x, plot.y + plot.height)
        .dash(2, { space: 2 })
        .lineWidth(0.75)
        .strokeColor(COLOUR.rule)
        .stroke()
        .undash();
    }

    // The settled start and the lowest pressure the limit allows, over the judged window.
    if (hold.start && hold.allowedLow !== null) {
      const from = px(hold.start.sec);
      const to = px(Math.min(hold.endSec, xMax));
      const startY = py(hold.start.value);
      this.doc
        .moveTo(from, startY)
        .lineTo(to, startY)
        .dash(1, { space: 2.5 })
        .lineWidth(0.75)
        .strokeColor(COLOUR.rule)
        .stroke()
        .undash();
      const limitY = py(hold.allowedLow);
      this.doc
        .moveTo(from, limitY)
        .lineTo(to, limitY)
        .dash(5, { space: 3 })
        .lineWidth(1.4)
        .strokeColor(CHART_COLOUR.limit)
        .stroke()
        .undash();
      const limitText = `lowest allowed ${this.chartNumber(hold.allowedLow)} ${unit}`;
      this.font(true, 7.5, CHART_COLOUR.limit).text(limitText, to - 160, limitY + 3, {
        width: 158,
        align: 'right',
        lineBreak: false,
      });
    }

    // The readings: a line through them, a dot at each.
    if (hold.points.length > 0) {
      const [first, ...rest] = hold.points;
      this.doc.moveTo(px(first!.sec), py(first!.value));
      for (const point of rest) this.doc.lineTo(px(point.sec), py(point.value));
      this.doc.lineWidth(1.8).strokeColor(CHART_COLOUR.series).lineJoin('round').stroke();
      for (const point of hold.points)
        this.doc.circle(px(point.sec), py(point.value), 2.6).fill(CHART_COLOUR.series);
    }

    // Legend and the limit in words.
    let y = plot.y + plot.height + axisRoom;
    const legend: [string, () => void][] = [
      [
        'readings',
        () => {
          this.doc.moveTo(0, 4).lineTo(16, 4).lineWidth(1.8).strokeColor(CHART_COLOUR.series).stroke();
          this.doc.circle(8, 4, 2.6).fill(CHART_COLOUR.series);
        },
      ],
      [
        'lowest allowed (settled start less the allowed fall)',
        () => {
          this.doc.moveTo(0, 4).lineTo(16, 4).dash(5, { space: 3 }).lineWidth(1.4);
          this.doc.strokeColor(CHART_COLOUR.limit).stroke().undash();
        },
      ],
      ['settling, not judged', () => this.doc.rect(0, 0, 16, 8).fill(COLOUR.ground)],
    ];
    let x = plot.x;
    for (const [text, swatch] of legend) {
      this.doc.save();
      this.doc.translate(x, y);
      swatch();
      this.doc.restore();
      this.font(false, 8, COLOUR.soft);
      const textWidth = this.doc.widthOfString(text);
      this.doc.text(text, x + 20, y, { width: textWidth + 2, lineBreak: false });
      x += 20 + textWidth + 16;
    }
    y += 14;
    const drop = `${this.chartNumber(hold.maxDrop)} ${unit}`;
    const source = hold.specSource === 'generic' ? GENERIC_LABEL : MANUAL_LABEL;
    this.font(false, 8.5, COLOUR.soft).text(
      `Limit: a fall of no more than ${drop} from ${hold.settleSec} s to ${round(hold.endSec / 60, 1)} min (${source}).`,
      plot.x,
      y,
      { width: plot.width },
    );
    this.y = this.doc.y + 12;
  }

  /** Chart numbers to a tenth, trailing zero dropped: 39 → "39", 38.95 → "39", 31.15 → "31.2". */
  private chartNumber(value: number): string {
    return String(round(value, 1));
  }

  private findings(check: ReportCheck): void {
    if (check.findings.length === 0 && !check.nextAction && check.causes.length === 0) return;
    this.ensureRoom(60);
    this.y = this.label('Findings', this.left, this.y, this.width);
    if (check.findings.length === 0) {
      this.paragraph('No fault was found by this check.', 9.5, COLOUR.soft);
    }
    for (const finding of check.findings) {
      const pad = 6;
      const textWidth = this.width - 18 - 110;
      const body = `${finding.detail} Next: ${finding.nextAction}`;
      const height =
        this.textHeight(finding.title, textWidth, true, 10) +
        this.textHeight(body, textWidth, false, 9) +
        pad * 2 +
        2;
      this.ensureRoom(height + 4);
      const top = this.y;
      this.doc.rect(this.left, top, 3.5, height).fill(VERDICT_INK[finding.verdict]);
      this.font(true, 10).text(finding.title, this.left + 12, top + pad, { width: textWidth });
      this.font(false, 9).text(body, this.left + 12, this.doc.y + 2, { width: textWidth });
      this.verdictTag(finding.verdict, this.left + this.width - 104, top + pad - 1, 104);
      this.y = top + height + 6;
    }
    if (check.causes.length > 0) {
      this.ensureRoom(40);
      this.y += 2;
      this.font(true, 9.5).text('Probable causes, most likely first', this.left, this.y, {
        width: this.width,
      });
      this.y = this.doc.y + 3;
      check.causes.forEach((cause, index) => {
        const text = `${index + 1}. ${cause.title} (${cause.likelihood} likelihood)${
          cause.evidence.length > 0 ? `: ${cause.evidence.join('; ')}` : ''
        }`;
        this.paragraph(text, 9);
      });
    }
    if (check.nextAction) {
      this.paragraph(`What comes next: ${check.nextAction}`, 9.5, COLOUR.ink, true);
    }
    if (check.advice.length > 0) {
      this.ensureRoom(30);
      this.font(true, 9).text('Keeping it running', this.left, this.y, { width: this.width });
      this.y = this.doc.y + 2;
      for (const line of check.advice) this.paragraph(`•  ${line}`, 8.5, COLOUR.soft);
    }
    this.y += 4;
  }

  private readingsHeader(columns: number[]): void {
    const height = 18;
    this.doc.rect(this.left, this.y, this.width, height).fill(COLOUR.ground);
    const heads = ['Taken', 'Quantity', 'As typed', 'Stored as', 'Taken in'];
    let x = this.left + 6;
    this.font(true, 8.5);
    heads.forEach((head, i) => {
      this.doc.text(head, x, this.y + 5, { width: columns[i]! - 8 });
      x += columns[i]!;
    });
    this.y += height;
    this.rule(this.y, COLOUR.ink, 0.75);
    this.y += 1;
  }

  private readings(): void {
    const { readings } = this.data;
    this.heading('Every reading taken', 50);
    if (readings.length === 0) {
      this.paragraph('No readings were recorded on this visit.', 9.5, COLOUR.soft);
      return;
    }
    this.paragraph(
      'Each value is shown as the mechanic typed it and as Vanbay stores it (pressure in kPa, flow in L/h, voltage in V).',
      8.5,
      COLOUR.soft,
    );
    const columns = [96, 76, 82, 90];
    columns.push(this.width - columns.reduce((a, b) => a + b, 0));
    this.ensureRoom(18 + 16);
    this.readingsHeader(columns);
    for (const reading of readings) {
      const cells = [reading.takenAt, reading.quantity, reading.typed, reading.stored, reading.takenIn];
      const height =
        Math.max(...cells.map((cell, i) => this.textHeight(cell, columns[i]! - 8, i === 2, 8.5))) + 7;
      if (this.ensureRoom(height)) this.readingsHeader(columns);
      let x = this.left + 6;
      cells.forEach((cell, i) => {
        this.font(i === 2, 8.5, i === 2 ? COLOUR.ink : COLOUR.soft).text(cell, x, this.y + 3.5, {
          width: columns[i]! - 8,
        });
        x += columns[i]!;
      });
      this.y += height;
      this.rule(this.y, COLOUR.grid, 0.4);
    }
    this.y += 10;
  }

  private work(): void {
    const { job, work } = this.data;
    this.heading('Work done', 40);
    if (job.workDone) this.paragraph(job.workDone, 9.5);
    if (work.length === 0) {
      if (!job.workDone) this.paragraph('No work has been recorded on this job yet.', 9.5, COLOUR.soft);
      return;
    }
    const kindWidth = 70;
    const quantityWidth = 70;
    const descriptionWidth = this.width - kindWidth - quantityWidth - 12;
    for (const line of work) {
      const height = this.textHeight(line.description, descriptionWidth, false, 9.5) + 6;
      this.ensureRoom(height);
      this.font(false, 9, COLOUR.soft).text(KIND_WORDS[line.kind], this.left, this.y, { width: kindWidth });
      this.font(false, 9.5).text(line.description, this.left + kindWidth, this.y, {
        width: descriptionWidth,
      });
      const unit = line.kind === 'labour' ? ' h' : '';
      this.font(true, 9.5).text(
        `${formatQuantity(line.quantityMilli)}${unit}`,
        this.left + this.width - quantityWidth,
        this.y,
        {
          width: quantityWidth,
          align: 'right',
        },
      );
      this.y += height;
      this.rule(this.y - 2, COLOUR.grid, 0.4);
    }
    this.y += 4;
    this.paragraph(
      'Prices are on the estimate and the invoice; this report records what was found and done.',
      8.5,
      COLOUR.soft,
    );
  }

  private safety(): void {
    const { cautions, deferLine } = this.data;
    this.heading('Safety and the service manual', 60);
    if (cautions.length > 0) {
      this.paragraph(
        'This work involved the hazards below; the same cautions were shown to the mechanic before each step.',
        9,
        COLOUR.soft,
      );
    }
    const pad = 9;
    const text = `${deferLine} The service manual's specification governs every limit in this report.`;
    const boxHeight = this.textHeight(text, this.width - pad * 2 - 4, true, 9.5) + pad * 2;
    cautions.forEach((caution, index) => {
      const bullets = caution.lines.reduce(
        (sum, line) => sum + this.textHeight(`•  ${line}`, this.width, false, 9) + 6,
        0,
      );
      // The last caution stays on the page with the deferral that closes the section.
      this.ensureRoom(16 + bullets + (index === cautions.length - 1 ? boxHeight + 8 : 0));
      this.font(true, 9.5).text(caution.title, this.left, this.y, { width: this.width });
      this.y = this.doc.y + 2;
      for (const line of caution.lines) this.paragraph(`•  ${line}`, 9);
      this.y += 2;
    });
    const height = boxHeight;
    this.ensureRoom(height + 4);
    this.doc.rect(this.left, this.y, this.width, height).fill(COLOUR.warnWash);
    this.doc.rect(this.left, this.y, 4, height).fill(COLOUR.warn);
    this.font(true, 9.5).text(text, this.left + pad + 4, this.y + pad, { width: this.width - pad * 2 - 4 });
    this.y += height + 6;
  }

}

/** Renders a diagnostic report to PDF bytes on Letter or A4 paper. */
export function renderReportPdf(data: ReportDocument, paper: Paper): Promise<Buffer> {
  return new ReportLayout(data, paper).render();
}
