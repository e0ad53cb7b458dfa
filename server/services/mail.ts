/**
 * The outbox: every mail is a row first, then an attempt. The row's idempotency key (unique per
 * business) means a request repeated, raced or retried lands one row, and an attempt first claims
 * the row by bumping `attempts` from the value it read — two senders never both win the claim,
 * so a message is handed to SMTP at most once per claim and never again once `sent`.
 * A failed attempt keeps the row (`failed`, `lastError`); `retryFailedMail` tries it again with
 * backoff until it goes, and takes up an attempt the server was stopped in the middle of. Attachments are not stored (the column keeps names and sizes only), so
 * each attempt renders them again from the record they belong to.
 */
import { and, asc, eq, gt, inArray, like, or, sql } from 'drizzle-orm';
import type { OutboxItem } from '../../shared/api/outbox';
import type { Actor } from '../auth/actor';
import type { Db } from '../db/client';
import * as t from '../db/schema';
import { BadRequestError, ConflictError, HttpError } from '../errors';
import type { Mailer, OutgoingAttachment } from '../mail/mailer';
import { recordAudit } from './audit';
import { invoicePdf } from './invoice-documents';
import { jobDocumentAttachments } from './document-attachments';
import { loadBusiness } from './invoices';
import { toOutboxItem } from './outbox';
import { found, scoped } from './scope';
import { businessTimezone, dayIn } from './business-calendar';
import { judgeInterval } from './service-intervals';

type Row = typeof t.outbox.$inferSelect;
type StoredAttachment = { filename: string; contentType: string; sizeBytes: number | null };

/** Backoff after the n-th failed attempt: 1 min, doubling, capped at 1 h (common practice for retry queues, no published source). */
export const RETRY_BASE_MS = 60_000;
export const RETRY_MAX_MS = 60 * 60_000;
/** A row queued but never attempted this long (its sender died before trying) is picked up by the retry pass. */
export const UNTRIED_AFTER_MS = 2 * 60_000;
/**
 * An attempt still under way this long after it claimed its row was cut off: the server stopped
 * mid-send (killed, the van's battery gone). SMTP's own waits end such an attempt within about a
 * minute (server/mail/mailer.ts TIMEOUTS), so ten minutes cannot catch one still running.
 */
export const INTERRUPTED_AFTER_MS = 10 * 60_000;
/** Rows looked at per retry pass; the rest wait for the next pass. */
const RETRY_BATCH = 50;
/** SMTP replies can be long; the outbox keeps the first part. */
const MAX_ERROR_CHARS = 500;

export function retryDelayMs(failedAttempts: number): number {
  if (failedAttempts < 1) return 0;
  return Math.min(RETRY_BASE_MS * 2 ** (failedAttempts - 1), RETRY_MAX_MS);
}

/**
 * When a failed row may be tried again. The table keeps no last-attempt time, so the schedule runs
 * from the row's creation: attempt n+1 is due once the delays after attempts 1…n have all passed.
 */
export function nextAttemptAt(row: Pick<Row, 'createdAt' | 'attempts'>): Date {
  let wait = 0;
  for (let n = 1; n <= row.attempts; n++) wait += retryDelayMs(n);
  return new Date(row.createdAt.getTime() + wait);
}

/**
 * Queued after an attempt claimed it, and for longer than any attempt runs: the attempt was cut
 * off. It may have reached the SMTP server before the cut, but the message keeps its Message-ID, so
 * a receiver that de-duplicates sees one; left alone it would never go, and no send could replace
 * it. A row claimed before attempts were timed (no `attemptedAt`) counts as cut off too.
 */
function interrupted(row: Row, now: Date): boolean {
  if (row.status !== 'queued' || row.attempts === 0) return false;
  return row.attemptedAt === null || row.attemptedAt.getTime() + INTERRUPTED_AFTER_MS <= now.getTime();
}

function isDue(row: Row, now: Date): boolean {
  if (row.status === 'failed') return nextAttemptAt(row) <= now;
  if (row.status !== 'queued') return false;
  // Never tried: its sender died before the first attempt. Tried and still queued: an attempt is
  // under way, unless it was cut off long ago.
  if (row.attempts === 0) return row.createdAt.getTime() + UNTRIED_AFTER_MS <= now.getTime();
  return interrupted(row, now);
}

// ---- Queue and deliver ----------------------------------------------------------------------

interface NewMail {
  businessId: number;
  kind: 'invoice' | 'reminder';
  to: string;
  subject: string;
  bodyText: string;
  attachments: StoredAttachment[];
  idempotencyKey: string;
  invoiceId?: number | null;
  jobId?: number | null;
}

type Writer = Pick<Db, 'insert' | 'select'>;

/** The row for this key: written now (`inserted`), or the one an earlier or racing call wrote. */
export async function enqueueMail(
  db: Writer,
  mail: NewMail,
  now: Date,
): Promise<{ row: Row; inserted: boolean }> {
  const [written] = await db
    .insert(t.outbox)
    .values({ ...mail, status: 'queued', attempts: 0, createdAt: now })
    .onConflictDoNothing({ target: [t.outbox.businessId, t.outbox.idempotencyKey] })
    .returning();
  if (written) return { row: written, inserted: true };
  const [existing] = await db
    .select()
    .from(t.outbox)
    .where(and(eq(t.outbox.businessId, mail.businessId), eq(t.outbox.idempotencyKey, mail.idempotencyKey)));
  return { row: found(existing, 'outbox mail'), inserted: false };
}

/**
 * One attempt at a row as it was read. Returns the row afterwards; when another sender claimed
 * it first (or it is already sent) nothing is sent and the current row comes back.
 * `rendered` are attachments the caller already made for this attempt; otherwise they are made here.
 */
export async function deliverMail(
  db: Db,
  mailer: Mailer,
  seen: Row,
  now: Date,
  options: { actor?: Actor; rendered?: OutgoingAttachment[] } = {},
): Promise<Row> {
  return (await attemptMail(db, mailer, seen, now, options)).row;
}

async function attemptMail(
  db: Db,
  mailer: Mailer,
  seen: Row,
  now: Date,
  options: { actor?: Actor; rendered?: OutgoingAttachment[] },
): Promise<{ row: Row; attempted: boolean }> {
  const [claimed] = await db
    .update(t.outbox)
    .set({ attempts: sql`${t.outbox.attempts} + 1`, status: 'queued', attemptedAt: now })
    .where(
      and(
        eq(t.outbox.id, seen.id),
        inArray(t.outbox.status, ['queued', 'failed']),
        eq(t.outbox.attempts, seen.attempts),
      ),
    )
    .returning();
  if (!claimed) return { row: await reload(db, seen.id), attempted: false };

  let attachments: OutgoingAttachment[];
  try {
    // Inside the try: whatever stops this attempt is recorded on the row, never left half-claimed.
    const business = await loadBusiness(db, claimed.businessId);
    const actor = options.actor ?? (await senderActor(db, claimed.businessId, now));
    attachments = options.rendered ?? (await renderAttachments(db, actor, claimed, now));
    await mailer.send({
      from: { name: business.name, address: business.email },
      to: claimed.to,
      subject: claimed.subject,
      text: claimed.bodyText,
      messageId: messageIdFor(claimed),
      attachments,
    });
  } catch (error) {
    const lastError = describeError(error);
    const row = await db.transaction(async (tx) => {
      const [failed] = await tx
        .update(t.outbox)
        .set({ status: 'failed', lastError })
        .where(eq(t.outbox.id, claimed.id))
        .returning();
      await recordAudit(tx, {
        businessId: claimed.businessId,
        actorId: options.actor?.userId ?? null,
        action: 'mail.failed',
        entityType: 'outbox',
        entityId: claimed.id,
        details: { kind: claimed.kind, attempt: claimed.attempts, lastError },
        at: now,
      });
      return failed!;
    });
    return { row, attempted: true };
  }
  const row = await db.transaction(async (tx) => {
    const [sent] = await tx
      .update(t.outbox)
      .set({
        status: 'sent',
        sentAt: now,
        lastError: null,
        attachments: attachments.map((a) => ({
          filename: a.filename,
          contentType: a.contentType,
          sizeBytes: a.content.length,
        })),
      })
      .where(eq(t.outbox.id, claimed.id))
      .returning();
    if (claimed.kind === 'invoice' && claimed.invoiceId !== null) {
      await tx
        .update(t.invoices)
        .set({ sentAt: now, updatedAt: now })
        .where(and(eq(t.invoices.businessId, claimed.businessId), eq(t.invoices.id, claimed.invoiceId)));
    }
    if (claimed.kind === 'reminder') {
      // A reminder closed (done, dismissed) while its mail waited stays closed.
      await tx
        .update(t.reminders)
        .set({ status: 'sent', sentAt: now })
        .where(and(eq(t.reminders.mailId, claimed.id), inArray(t.reminders.status, ['pending', 'sent'])));
    }
    await recordAudit(tx, {
      businessId: claimed.businessId,
      actorId: options.actor?.userId ?? null,
      action: 'mail.sent',
      entityType: 'outbox',
      entityId: claimed.id,
      details: {
        kind: claimed.kind,
        to: claimed.to,
        invoiceId: claimed.invoiceId,
        attempt: claimed.attempts,
      },
      at: now,
    });
    return sent!;
  });
  return { row, attempted: true };
}

export interface RetryResult {
  attempted: number;
  sent: number;
  failed: number;
}

/**
 * One pass over the mail that is due another try (failed and past its backoff, queued and never
 * tried, or an attempt cut off long ago), oldest first. Safe to run alongside requests and other passes: each attempt claims its row.
 */
export async function retryFailedMail(db: Db, mailer: Mailer, now: Date): Promise<RetryResult> {
  const result: RetryResult = { attempted: 0, sent: 0, failed: 0 };
  if (!mailer.available) return result;
  let after = 0;
  for (;;) {
    const batch = await db
      .select()
      .from(t.outbox)
      .where(
        and(
          gt(t.outbox.id, after),
          inArray(t.outbox.status, ['failed', 'queued']),
        ),
      )
      .orderBy(asc(t.outbox.id))
      .limit(RETRY_BATCH);
    for (const row of batch.filter((r) => isDue(r, now))) {
      const { row: outcome, attempted } = await attemptMail(db, mailer, row, now, {});
      if (!attempted) continue; // another sender's claim won
      result.attempted++;
      if (outcome.status === 'sent') result.sent++;
      else result.failed++;
    }
    if (batch.length < RETRY_BATCH) return result;
    after = batch.at(-1)!.id;
  }
}

/** Runs `retryFailedMail` every `everyMs` until stopped; a pass never overlaps the previous one. */
export function startMailRetries(
  db: Db,
  mailer: Mailer,
  clock: () => Date,
  everyMs = RETRY_BASE_MS,
  onError: (error: unknown) => void = (error) => console.error('mail retry pass failed:', error),
): () => void {
  let running = false;
  const timer = setInterval(() => {
    if (running) return;
    running = true;
    retryFailedMail(db, mailer, clock())
      .catch(onError)
      .finally(() => {
        running = false;
      });
  }, everyMs);
  timer.unref();
  return () => clearInterval(timer);
}

// ---- Invoice and reminder mail -------------------------------------------------------------

export function requireMailer(mailer: Mailer) {
  if (!mailer.available) throw new HttpError(503, 'mail_not_set_up', 'mail is not set up');
}

const invoiceNumber = (n: number) => String(n).padStart(4, '0');
const dollars = (cents: number) => `$${(cents / 100).toFixed(2)}`;

/**
 * Mails an invoice with its PDF to the customer (202 with the outbox row, sent or failed and
 * waiting for a retry). Once an invoice has been sent (or a send is waiting), only `again` sends
 * it again: a failed send still waiting is tried now; otherwise a new mail is queued.
 */
export async function sendInvoiceMail(
  db: Db,
  mailer: Mailer,
  actor: Actor,
  invoiceId: number,
  options: { again: boolean; beforeRender?: () => Promise<void> },
  now: Date,
): Promise<OutboxItem> {
  requireMailer(mailer);
  const [found_] = await db
    .select({ invoice: t.invoices, customer: t.customers })
    .from(t.invoices)
    .innerJoin(t.customers, eq(t.customers.id, t.invoices.customerId))
    .where(
      scoped(
        actor,
        { businessId: t.invoices.businessId, customerId: t.invoices.customerId },
        eq(t.invoices.id, invoiceId),
      ),
    );
  const { invoice, customer } = found(found_, 'invoice');
  const label = invoiceNumber(invoice.number);
  if (invoice.status === 'void') throw new ConflictError(`Invoice ${label} is void; it is not sent.`);
  if (!customer.email) {
    throw new BadRequestError(`${customer.name} has no e-mail address; add one to the customer first.`);
  }
  const earlier = await db
    .select()
    .from(t.outbox)
    .where(
      and(
        eq(t.outbox.businessId, actor.businessId),
        eq(t.outbox.kind, 'invoice'),
        eq(t.outbox.invoiceId, invoice.id),
      ),
    )
    .orderBy(asc(t.outbox.id));
  const waiting = resendGate(earlier, invoice.sentAt !== null, options.again, `Invoice ${label}`, now);
  if (waiting) return toOutboxItem(await deliverMail(db, mailer, waiting, now, { actor }));

  const business = await loadBusiness(db, actor.businessId);
  // A new mail only: the caller's last word on the invoice (its card link) before PDF and body.
  if (options.beforeRender) {
    await options.beforeRender();
    const [linked] = await db
      .select({ paymentLinkUrl: t.invoices.paymentLinkUrl })
      .from(t.invoices)
      .where(and(eq(t.invoices.businessId, actor.businessId), eq(t.invoices.id, invoice.id)));
    invoice.paymentLinkUrl = linked?.paymentLinkUrl ?? null;
  }
  const pdf = await invoicePdf(db, actor, invoice.id, { now });
  const rendered = [{ filename: pdf.filename, contentType: 'application/pdf', content: pdf.bytes }];
  const { row, inserted } = await enqueueMail(
    db,
    {
      businessId: actor.businessId,
      kind: 'invoice',
      to: customer.email,
      subject: `Invoice ${label} from ${business.name}`,
      bodyText: invoiceBody({ invoice, customerName: customer.name, business, label }),
      attachments: rendered.map((a) => ({
        filename: a.filename,
        contentType: a.contentType,
        sizeBytes: a.content.length,
      })),
      idempotencyKey: `invoice:${invoice.id}:${earlier.length + 1}`,
      invoiceId: invoice.id,
      jobId: invoice.jobId,
    },
    now,
  );
  // A racing request wrote this key first: its attempt is the one; this one sends nothing.
  if (!inserted) return toOutboxItem(row);
  return toOutboxItem(await deliverMail(db, mailer, row, now, { actor, rendered }));
}

function invoiceBody(input: {
  invoice: typeof t.invoices.$inferSelect;
  customerName: string;
  business: typeof t.businesses.$inferSelect;
  label: string;
}): string {
  const { invoice, business } = input;
  return [
    `Hello ${input.customerName},`,
    '',
    `Invoice ${input.label} from ${business.name} is attached as a PDF.`,
    '',
    `Total: ${dollars(invoice.totalCents)}`,
    `Balance due: ${dollars(invoice.balanceCents)}`,
    `Due by: ${invoice.dueOn}`,
    ...(invoice.paymentLinkUrl ? [`Pay by card: ${invoice.paymentLinkUrl}`] : []),
    '',
    'Thank you,',
    business.ownerName,
    business.name,
    ...(business.phone ? [business.phone] : []),
  ].join('\n');
}

/**
 * Mails the customer about a service item coming due and marks the reminder sent once the mail
 * has gone. A reminder already sent (or with a mail waiting) goes again only with `again`.
 */
export async function sendReminderMail(
  db: Db,
  mailer: Mailer,
  actor: Actor,
  reminderId: number,
  options: { again: boolean },
  now: Date,
): Promise<OutboxItem> {
  requireMailer(mailer);
  const [target] = await db
    .select({
      reminder: t.reminders,
      interval: t.serviceIntervals,
      machine: t.machines,
      customer: t.customers,
    })
    .from(t.reminders)
    .innerJoin(t.serviceIntervals, eq(t.serviceIntervals.id, t.reminders.serviceIntervalId))
    .innerJoin(t.machines, eq(t.machines.id, t.reminders.machineId))
    .innerJoin(t.customers, eq(t.customers.id, t.reminders.customerId))
    .where(
      scoped(
        actor,
        { businessId: t.reminders.businessId, customerId: t.reminders.customerId },
        eq(t.reminders.id, reminderId),
      ),
    );
  const { reminder, interval, machine, customer } = found(target, 'reminder');
  if (reminder.status === 'done' || reminder.status === 'dismissed') {
    throw new ConflictError(`This reminder is already ${reminder.status}; it is not sent.`, {
      status: reminder.status,
    });
  }
  if (!customer.email) {
    throw new BadRequestError(`${customer.name} has no e-mail address; add one to the customer first.`);
  }
  const key = `reminder:${reminder.id}:`;
  const earlier = await db
    .select()
    .from(t.outbox)
    .where(
      and(
        eq(t.outbox.businessId, actor.businessId),
        or(
          like(t.outbox.idempotencyKey, `${key}%`),
          reminder.mailId === null ? undefined : eq(t.outbox.id, reminder.mailId),
        ),
      ),
    )
    .orderBy(asc(t.outbox.id));
  const waiting = resendGate(earlier, reminder.status === 'sent', options.again, 'This reminder', now);
  if (waiting) return toOutboxItem(await deliverMail(db, mailer, waiting, now, { actor }));

  const business = await loadBusiness(db, actor.businessId);
  const timezone = await businessTimezone(db, actor.businessId);
  const state = judgeInterval(interval, machine, dayIn(timezone, now));
  const machineName = [machine.year, machine.make, machine.model].filter((x) => x !== null).join(' ');
  const { row, inserted } = await db.transaction(async (tx) => {
    const queued = await enqueueMail(
      tx,
      {
        businessId: actor.businessId,
        kind: 'reminder',
        to: customer.email!,
        subject: `${machineName}: ${interval.label.toLowerCase()} due`,
        bodyText: [
          `Hello ${customer.name},`,
          '',
          `Your ${machineName} is coming due for: ${interval.label} (due by ${reminder.dueOn}).`,
          state.reason,
          '',
          `Reply to this e-mail${business.phone ? ` or call ${business.phone}` : ''} to book a visit.`,
          '',
          business.ownerName,
          business.name,
        ].join('\n'),
        attachments: [],
        idempotencyKey: `${key}${earlier.length + 1}`,
      },
      now,
    );
    // The delivered mail finds its reminder by this link (the outbox has no reminder column).
    if (queued.inserted) {
      await tx.update(t.reminders).set({ mailId: queued.row.id }).where(eq(t.reminders.id, reminder.id));
    }
    return queued;
  });
  if (!inserted) return toOutboxItem(row);
  return toOutboxItem(await deliverMail(db, mailer, row, now, { actor }));
}

/**
 * The rule for sending something again: nothing sent yet → go ahead (null); already sent or
 * waiting → 409 unless `again`; with `again`, a failed mail still waiting is the one to try now
 * (returned) rather than a second copy, and an attempt under way is left alone (409).
 */
export function resendGate(
  earlier: Row[],
  markedSent: boolean,
  again: boolean,
  what: string,
  now: Date,
): Row | null {
  if (earlier.length === 0 && !markedSent) return null;
  if (!again) {
    // Never sent yet, only waiting (a failed attempt, or one under way): say so, not "already sent".
    const waiting = !markedSent && earlier.every((r) => r.status !== 'sent');
    throw new ConflictError(
      waiting
        ? `${what} is waiting in the outbox and is tried again on its own; send it again to try it now.`
        : `${what} was already sent; send it again (again=true) for one more copy.`,
      { mailIds: earlier.map((r) => r.id), waiting },
    );
  }
  const pending = earlier.filter((r) => r.status !== 'sent');
  const underWay = pending.find((r) => r.status === 'queued' && r.attempts > 0 && !interrupted(r, now));
  if (underWay) throw new ConflictError(`${what} is being sent right now.`, { mailId: underWay.id });
  return pending.at(-1) ?? null;
}

// ---- Helpers --------------------------------------------------------------------------------

async function reload(db: Db, id: number): Promise<Row> {
  const [row] = await db.select().from(t.outbox).where(eq(t.outbox.id, id));
  return found(row, 'outbox mail');
}

/** What each kind of mail attaches, made again for every attempt. */
async function renderAttachments(db: Db, actor: Actor, row: Row, now: Date): Promise<OutgoingAttachment[]> {
  if (row.kind === 'invoice' && row.invoiceId !== null) {
    const pdf = await invoicePdf(db, actor, row.invoiceId, { now });
    return [{ filename: pdf.filename, contentType: 'application/pdf', content: pdf.bytes }];
  }
  // A report or estimate mail re-renders its own PDF, so a retry carries it as the first try did.
  const documents = await jobDocumentAttachments(db, actor, row, now);
  if (documents) return documents;
  return [];
}

/**
 * A retry pass has no signed-in person: it renders as the business's owner, whose mail it is
 * (the outbox is the owner's, server/auth/policy.ts).
 */
async function senderActor(db: Db, businessId: number, now: Date): Promise<Actor> {
  const [owner] = await db
    .select()
    .from(t.users)
    .where(and(eq(t.users.businessId, businessId), eq(t.users.role, 'owner')))
    .orderBy(asc(t.users.id))
    .limit(1);
  const user = found(owner, 'owner of the business');
  return {
    userId: user.id,
    businessId,
    role: 'owner',
    customerId: null,
    email: user.email,
    name: user.name,
    jti: 'mail-retry',
    expiresAt: now,
  };
}

/** RFC 5322 §3.6.4 msg-id: dot-atom text on the left, so the key's other characters become dots. */
function messageIdFor(row: Row): string {
  const left = `${row.businessId}.${row.idempotencyKey}`.replace(/[^A-Za-z0-9!#$%&'*+/=?^_`{|}~-]+/g, '.');
  return `<${left}@vanbay.invalid>`;
}

function describeError(error: unknown): string {
  const text = error instanceof Error ? `${error.message}` : String(error);
  return (text || 'unknown error').slice(0, MAX_ERROR_CHARS);
}
