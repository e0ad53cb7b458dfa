/**
 * `vanbay job …`: work orders from the van. Every subcommand works from flags alone; `job new`
 * asks for what is missing (searching customers and their machines as you type) when a person is
 * at the keyboard.
 */
import type { Command } from 'commander';
import { addDays, format, startOfWeek } from 'date-fns';
import { z } from 'zod';
import { CustomerListSchema, CustomerSchema, CUSTOMERS_PATH } from '../../shared/api/customers';
import {
  JOB_STATUS_LABELS,
  JOB_STATUSES,
  JOB_TRANSITIONS,
  JobDetailSchema,
  JobListSchema,
  JobSchema,
  JOBS_PATH,
  jobNotesPath,
  jobPath,
  jobStatusPath,
  type Job,
  type JobStatus,
} from '../../shared/api/jobs';
import { MachineListSchema, MachineSchema, MACHINES_PATH } from '../../shared/api/machines';
import { isValidVin, modelYearsFromVin, vinCheckDigit } from '../../shared/vin';
import { createApi, UnreachableError, type Api } from '../lib/api';
import { UsageError, type CliDeps } from '../lib/deps';
import { enqueue, newClientId } from '../lib/queue';
import { theme } from '../ui/theme';

const GlobalSchema = z.object({ json: z.boolean().optional(), server: z.string().optional() });

const jobNumber = (text: string) => {
  if (!/^\d+$/.test(text) || Number(text) <= 0)
    throw new UsageError(`JOB must be a job number, got "${text}"`);
  return Number(text);
};

const day = (date: Date) => format(date, 'yyyy-MM-dd');

/** Pages through the list route until `max` jobs or the end. */
async function listJobs(
  api: Api,
  query: Record<string, string | number | undefined>,
  max: number,
): Promise<Job[]> {
  const jobs: Job[] = [];
  let cursor: string | undefined;
  do {
    const page = await api.request('GET', JOBS_PATH, JobListSchema, {
      query: { ...query, limit: Math.min(100, max - jobs.length), cursor },
    });
    jobs.push(...page.items);
    cursor = page.nextCursor ?? undefined;
  } while (cursor && jobs.length < max);
  return jobs;
}

const ListOptionsSchema = GlobalSchema.extend({
  status: z.string().optional(),
  today: z.boolean().optional(),
  week: z.boolean().optional(),
  customer: z.string().regex(/^\d+$/, 'give the customer number').optional(),
  machine: z.string().regex(/^\d+$/, 'give the machine number').optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(50),
});

export async function runJobList(
  deps: CliDeps,
  options: z.infer<typeof ListOptionsSchema>,
  now = new Date(),
) {
  const statuses = options.status?.split(',').map((s) => s.trim().replace(/[\s-]+/g, '_'));
  const unknown = statuses?.filter((s) => !(JOB_STATUSES as readonly string[]).includes(s));
  if (unknown && unknown.length > 0) {
    throw new UsageError(`unknown status "${unknown[0]}" (one of ${JOB_STATUSES.join(', ')})`);
  }
  const monday = startOfWeek(now, { weekStartsOn: 1 });
  const range = options.today
    ? { from: day(now), to: day(now) }
    : options.week
      ? { from: day(monday), to: day(addDays(monday, 6)) }
      : {};
  const api = createApi(deps, options.server);
  return listJobs(
    api,
    { status: statuses?.join(','), customerId: options.customer, machineId: options.machine, ...range },
    options.limit,
  );
}

function printJobs(deps: CliDeps, jobs: Job[]) {
  if (jobs.length === 0) {
    deps.stdout.write('no jobs\n');
    return;
  }
  deps.stdout.write(
    theme.muted(`${'job'.padStart(5)}  ${'when'.padEnd(16)}  ${'status'.padEnd(17)}  complaint\n`),
  );
  for (const job of jobs) {
    const when = job.scheduledAt ? format(new Date(job.scheduledAt), 'EEE d MMM HH:mm') : '—';
    const complaint = job.complaint.length > 60 ? `${job.complaint.slice(0, 59)}…` : job.complaint;
    deps.stdout.write(
      `${String(job.id).padStart(5)}  ${when.padEnd(16)}  ${JOB_STATUS_LABELS[job.status].padEnd(17)}  ${complaint}\n`,
    );
  }
}

/** A customer by number, or the one customer a search finds; several or none is for a person to settle. */
async function resolveCustomer(deps: CliDeps, api: Api, text: string | undefined) {
  if (text && /^\d+$/.test(text)) return api.request('GET', `${CUSTOMERS_PATH}/${text}`, CustomerSchema);
  if (text) {
    const found = await api.request('GET', CUSTOMERS_PATH, CustomerListSchema, {
      query: { q: text, limit: 10 },
    });
    const exact = found.items.filter((c) => c.name.toLowerCase() === text.toLowerCase());
    if (exact.length === 1) return exact[0]!;
    if (found.items.length === 1) return found.items[0]!;
    if (!deps.interactive) {
      throw new UsageError(
        found.items.length === 0
          ? `no customer matches "${text}": add them from a terminal, or give a customer number`
          : `"${text}" matches ${found.items.length} customers: give a number (${found.items.map((c) => `${c.id} ${c.name}`).join(', ')})`,
      );
    }
  }
  if (!deps.interactive || !deps.prompt?.search) throw new UsageError('give --customer (a number or a name)');
  const NEW = -1;
  const picked = await deps.prompt.search({
    message: 'Customer (type to search)',
    source: async (term) => {
      const page = await api.request('GET', CUSTOMERS_PATH, CustomerListSchema, {
        query: { q: term || undefined, limit: 10 },
      });
      return [
        ...page.items.map((c) => ({ name: `${c.name}${c.town ? `, ${c.town}` : ''}`, value: c.id })),
        { name: `+ new customer${term ? ` "${term}"` : ''}`, value: NEW },
      ];
    },
  });
  if (picked !== NEW) return api.request('GET', `${CUSTOMERS_PATH}/${picked}`, CustomerSchema);
  const name = await deps.prompt.input({ message: 'New customer name', default: text });
  const phone = await deps.prompt.input({ message: 'Phone (optional)' });
  const email = await deps.prompt.input({ message: 'E-mail (optional)' });
  return api.request('POST', CUSTOMERS_PATH, CustomerSchema, {
    body: { name, ...(phone ? { phone } : {}), ...(email ? { email } : {}) },
  });
}

async function askVin(deps: CliDeps): Promise<{ vin: string | null; year: number | null }> {
  for (;;) {
    const vin = (await deps.prompt!.input({ message: 'VIN (17 characters; empty if it has none)' }))
      .trim()
      .toUpperCase();
    if (vin === '') return { vin: null, year: null };
    if (isValidVin(vin)) {
      const years = modelYearsFromVin(vin);
      const year = await deps.prompt!.input({
        message: `Model year (position 10 reads ${years.join(' or ')})`,
        default: String(years.at(-1) ?? ''),
      });
      return { vin, year: /^\d{4}$/.test(year) ? Number(year) : null };
    }
    const digit = vinCheckDigit(vin);
    deps.stderr.write(
      `${theme.fail('✗')} ${digit === null ? 'a VIN has 17 letters and digits, never I, O or Q' : `check digit should be ${digit}: a character is mistyped`}\n`,
    );
  }
}

async function resolveMachine(deps: CliDeps, api: Api, customerId: number, text: string | undefined) {
  if (text && /^\d+$/.test(text)) return api.request('GET', `${MACHINES_PATH}/${text}`, MachineSchema);
  const theirs = await api.request('GET', MACHINES_PATH, MachineListSchema, {
    query: { customerId, q: text, limit: 20 },
  });
  if (theirs.items.length === 1 && (text || !deps.interactive)) return theirs.items[0]!;
  if (!deps.interactive || !deps.prompt?.search) {
    throw new UsageError(
      theirs.items.length === 0
        ? `no machine of this customer matches${text ? ` "${text}"` : ''}: add it from a terminal`
        : `give --machine (one of ${theirs.items.map((m) => `${m.id} ${m.make} ${m.model}`).join(', ')})`,
    );
  }
  const NEW = -1;
  const picked = await deps.prompt.search({
    message: 'Machine',
    source: async (term) => [
      ...theirs.items
        .filter(
          (m) => !term || `${m.make} ${m.model} ${m.vin ?? ''}`.toLowerCase().includes(term.toLowerCase()),
        )
        .map((m) => ({
          name: `${m.year ?? ''} ${m.make} ${m.model}${m.vin ? `  ${m.vin}` : ''}`.trim(),
          value: m.id,
        })),
      { name: '+ new machine', value: NEW },
    ],
  });
  if (picked !== NEW) return api.request('GET', `${MACHINES_PATH}/${picked}`, MachineSchema);
  const kind = await deps.prompt.input({
    message: 'Kind (motorcycle, atv, side_by_side, snowmobile, watercraft, small_engine)',
  });
  const make = await deps.prompt.input({ message: 'Make' });
  const model = await deps.prompt.input({ message: 'Model' });
  const { vin, year } = await askVin(deps);
  const meterUnit = await deps.prompt.input({
    message: 'Meter (mi, km or h)',
    default: kind === 'motorcycle' ? 'mi' : 'h',
  });
  return api.request('POST', MACHINES_PATH, MachineSchema, {
    body: { customerId, kind, make, model, meterUnit, ...(vin ? { vin } : {}), ...(year ? { year } : {}) },
  });
}

const NewOptionsSchema = GlobalSchema.extend({
  customer: z.string().optional(),
  machine: z.string().optional(),
  complaint: z.string().max(2000).optional(),
  location: z.string().max(200).optional(),
  meter: z.coerce.number().min(0).optional(),
});

export async function runJobNew(deps: CliDeps, options: z.infer<typeof NewOptionsSchema>) {
  const api = createApi(deps, options.server);
  const customer = await resolveCustomer(deps, api, options.customer);
  const machine = await resolveMachine(deps, api, customer.id, options.machine);
  const complaint =
    options.complaint ??
    (deps.interactive && deps.prompt
      ? await deps.prompt.input({ message: 'Complaint (in the rider’s words)' })
      : undefined);
  if (!complaint) throw new UsageError('give --complaint');
  return api.request('POST', JOBS_PATH, JobSchema, {
    body: {
      customerId: customer.id,
      machineId: machine.id,
      complaint,
      scheduledAt: new Date().toISOString(),
      clientId: newClientId(),
      ...(options.location ? { location: options.location } : {}),
      ...(options.meter !== undefined ? { meterReading: options.meter } : {}),
    },
  });
}

export async function jobListAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = ListOptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const jobs = await runJobList(deps, options);
  if (options.json) deps.stdout.write(`${JSON.stringify(jobs)}\n`);
  else printJobs(deps, jobs);
}

export async function jobShowAction(deps: CliDeps, jobText: string, raw: unknown, command: Command) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const detail = await createApi(deps, options.server).request(
    'GET',
    jobPath(jobNumber(jobText)),
    JobDetailSchema,
  );
  if (options.json) {
    deps.stdout.write(`${JSON.stringify(detail)}\n`);
    return;
  }
  deps.stdout.write(`${theme.strong(`Job ${detail.id}`)}  ${JOB_STATUS_LABELS[detail.status]}\n`);
  deps.stdout.write(`${detail.customerName} · ${detail.machineName}\n${detail.complaint}\n`);
  if (detail.diagnosis) deps.stdout.write(`Diagnosis: ${detail.diagnosis}\n`);
  for (const event of detail.events) {
    const what = event.kind === 'status' ? `→ ${JOB_STATUS_LABELS[event.toStatus!]}` : 'note';
    deps.stdout.write(
      `${theme.muted(format(new Date(event.at), 'd MMM HH:mm'))}  ${what}${event.note ? `  ${event.note}` : ''}\n`,
    );
  }
  const next = JOB_TRANSITIONS[detail.status];
  if (next.length > 0)
    deps.stdout.write(theme.muted(`next: ${next.map((s) => JOB_STATUS_LABELS[s]).join(', ')}\n`));
}

export async function jobNewAction(deps: CliDeps, raw: unknown, command: Command) {
  const options = NewOptionsSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const created = await runJobNew(deps, options);
  if (options.json) deps.stdout.write(`${JSON.stringify(created)}\n`);
  else deps.stdout.write(`${theme.pass('booked')}  job ${created.id}\n`);
}

export async function jobStatusAction(
  deps: CliDeps,
  jobText: string,
  statusText: string,
  raw: { note?: string },
  command: Command,
) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const status = statusText.trim().replace(/[\s-]+/g, '_') as JobStatus;
  if (!JOB_STATUSES.includes(status))
    throw new UsageError(`unknown status "${statusText}" (one of ${JOB_STATUSES.join(', ')})`);
  const moved = await createApi(deps, options.server).request(
    'POST',
    jobStatusPath(jobNumber(jobText)),
    JobSchema,
    {
      body: { status, ...(raw.note ? { note: raw.note } : {}) },
    },
  );
  if (options.json) deps.stdout.write(`${JSON.stringify(moved)}\n`);
  else deps.stdout.write(`job ${moved.id}  ${JOB_STATUS_LABELS[moved.status]}\n`);
}

export async function jobNoteAction(
  deps: CliDeps,
  jobText: string,
  words: string[],
  raw: unknown,
  command: Command,
) {
  const options = GlobalSchema.parse({ ...command.optsWithGlobals(), ...(raw as object) });
  const id = jobNumber(jobText);
  const note = words.join(' ').trim();
  if (!note) throw new UsageError('the note is empty');
  const api = createApi(deps, options.server);
  const clientId = newClientId();
  try {
    await api.request('POST', jobNotesPath(id), z.unknown(), { body: { note, clientId } });
    if (options.json) deps.stdout.write(`${JSON.stringify({ queued: false, jobId: id, clientId })}\n`);
    else deps.stdout.write(`noted on job ${id}\n`);
  } catch (error) {
    if (!(error instanceof UnreachableError)) throw error;
    enqueue(deps.env, {
      clientId,
      server: api.server,
      method: 'POST',
      path: jobNotesPath(id),
      body: { note },
      summary: `note on job ${id}`,
    });
    deps.stderr.write(`${theme.warn('server unreachable')}: note queued; \`vanbay sync\` sends it\n`);
    if (options.json) deps.stdout.write(`${JSON.stringify({ queued: true, jobId: id, clientId })}\n`);
  }
}
