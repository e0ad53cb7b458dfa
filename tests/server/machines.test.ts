import { and, count, eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
// @ts-expect-error -- vin-validator ships no type declarations; its one function is typed below.
import vinValidator from 'vin-validator';
import * as t from '../../server/db/schema';
import { MachineHistorySchema, MachineListSchema, MachineSchema } from '../../shared/api/machines';
import { as, seededApi, type TestApi } from '../helpers/api';

const validateWithLibrary: (vin: string) => boolean = vinValidator.validate;

/** NIST SP 811, Appendix B.8: 1 psi = 6.894 757 293 168 kPa (exact from the pound-force and the inch). */
const KPA_PER_PSI = 6.894757293168;

let api: TestApi;
let julesId: number;
let rowanId: number;
beforeAll(async () => {
  api = await seededApi();
  const customers = await api.database.db.select().from(t.customers);
  julesId = customers.find((c) => c.email === 'jules@example.test')!.id;
  rowanId = customers.find((c) => c.email === 'rowan@example.test')!.id;
});
afterAll(() => api.close());

const machineCount = async () => (await api.database.db.select({ n: count() }).from(t.machines))[0]!.n;

function newMachine(body: Record<string, unknown>) {
  return request(api.app)
    .post('/api/machines')
    .set(as(api, 'owner'))
    .send({
      customerId: rowanId,
      kind: 'motorcycle',
      make: 'Kestrel',
      model: 'Quillback 400',
      meterUnit: 'mi',
      ...body,
    });
}

describe('machines: VIN', () => {
  it('accepts the 49 CFR 565.15 worked example and decodes its model years', async () => {
    // 1M8GDM9AXKP042788: check digit X (49 CFR 565.15 worked example, REFERENCES.md).
    expect(validateWithLibrary('1M8GDM9AXKP042788')).toBe(true); // vin-validator agrees
    const response = await newMachine({ vin: '1m8gdm9axkp042788', year: 2019 }).expect(201);
    const machine = MachineSchema.parse(response.body);
    expect(machine.vin).toBe('1M8GDM9AXKP042788');
    // Position 10 is K, the 10th code of the 30-year cycle (I skipped): 1980 + 9 = 1989, and 2019 (49 CFR 565.15).
    expect(machine.modelYears).toEqual([1989, 2019]);
  });

  it('refuses the example with one digit changed, naming the check digit it needs', async () => {
    const before = await machineCount();
    // Last character 8 → 9 adds 1 × weight 2 to the weighted sum: 351 + 2 = 353, 353 mod 11 = 1 (hand arithmetic, 49 CFR 565.15 weights).
    expect(validateWithLibrary('1M8GDM9AXKP042789')).toBe(false); // vin-validator agrees
    const response = await newMachine({ vin: '1M8GDM9AXKP042789' }).expect(400);
    expect(response.body.error.message).toMatch(/vin: .*needs 1\b/);
    // A VIN never uses O (49 CFR 565.15); 16 characters is not a VIN.
    for (const vin of ['1M8GDM9AXKP04278O', '1M8GDM9AXKP04278']) {
      const bad = await newMachine({ vin }).expect(400);
      expect(bad.body.error.message).toMatch(/^Invalid body: vin: /);
    }
    expect(await machineCount()).toBe(before);
  });

  it('refuses a year the VIN cannot stand for, on create and on patch', async () => {
    // K stands for 1989 or 2019 (49 CFR 565.15 cycle), so 2018 is a slip somewhere.
    const refused = await newMachine({ vin: '1M8GDM9AXKP042788', year: 2018 }).expect(400);
    expect(refused.body.error.message).toContain('1989 or 2019');
    const made = await newMachine({ year: 2018, otherId: 'HIN-free-text O Q I ok' }).expect(201);
    expect(made.body.modelYears).toEqual([]);
    await request(api.app)
      .patch(`/api/machines/${made.body.id}`)
      .set(as(api, 'owner'))
      .send({ vin: '1M8GDM9AXKP042788' })
      .expect(400);
    const fixed = await request(api.app)
      .patch(`/api/machines/${made.body.id}`)
      .set(as(api, 'owner'))
      .send({ vin: '1M8GDM9AXKP042788', year: 2019 })
      .expect(200);
    expect(fixed.body.modelYears).toEqual([1989, 2019]);
  });
});

describe('machines: specs', () => {
  it('converts typed specs to kPa, minutes and L/h, and labels each manual or generic', async () => {
    const response = await newMachine({
      fuelPressureMinKpa: '39psi',
      fuelPressureMaxKpa: '3.2 bar',
      holdMaxDropKpa: 20,
      holdMinutes: '300 s',
    }).expect(201);
    const machine = MachineSchema.parse(response.body);
    expect(machine.fuelPressureMinKpa).toBeCloseTo(39 * KPA_PER_PSI, 8); // NIST SP 811 B.8
    expect(machine.fuelPressureMaxKpa).toBe(320); // 1 bar = 100 kPa exactly (NIST SP 811)
    expect(machine.holdMaxDropKpa).toBe(20); // a number is taken in the canonical unit, kPa
    expect(machine.holdMinutes).toBe(5); // 300 s / 60 (hand arithmetic)
    expect(machine.flowMinLph).toBeNull();
    expect(machine.specs.fuelPressureMinKpa).toMatchObject({
      source: 'manual',
      value: machine.fuelPressureMinKpa,
    });
    // No flow figure from the manual: the generic 30 L/h (common practice, no published source; shared/procedures/specs.ts).
    expect(machine.specs.flowMinLph).toEqual({ value: 30, source: 'generic', genericValue: 30 });
    // The generic band's bottom is 39 psi (common practice, no published source) in kPa by NIST SP 811 B.8.
    expect(machine.specs.fuelPressureMinKpa.genericValue).toBeCloseTo(39 * KPA_PER_PSI, 8);
  });

  it('refuses a unit of the wrong kind, a bare number in text and an upside-down band', async () => {
    const before = await machineCount();
    for (const body of [
      { fuelPressureMinKpa: '30 L/h' },
      { flowMinLph: '43psi' },
      { holdMinutes: '12V' },
      { fuelPressureMaxKpa: '43' },
      { flowMinLph: '30 furlongs' },
      { fuelPressureMinKpa: -5 },
      { fuelPressureMinKpa: '46psi', fuelPressureMaxKpa: '40psi' },
    ]) {
      const response = await newMachine(body).expect(400);
      expect(response.body.error.code).toBe('bad_request');
    }
    const wrongKind = await newMachine({ fuelPressureMinKpa: '30 L/h' });
    expect(wrongKind.body.error.message).toContain('fuelPressureMinKpa');
    expect(await machineCount()).toBe(before);
  });

  it('patches a spec and clears it back to the generic default with null', async () => {
    const made = await newMachine({ flowMinLph: '0.5 gal/h' }).expect(201);
    // 0.5 US gal/h × 3.785 411 784 L/gal (exact; NIST SP 811 B.8) = 1.892 705 892 L/h.
    expect(made.body.flowMinLph).toBeCloseTo(1.892705892, 9);
    const cleared = await request(api.app)
      .patch(`/api/machines/${made.body.id}`)
      .set(as(api, 'helper'))
      .send({ flowMinLph: null, specsNote: 'Manual figure withdrawn.' })
      .expect(200);
    expect(cleared.body.flowMinLph).toBeNull();
    expect(cleared.body.specs.flowMinLph.source).toBe('generic');
    // The band is checked against the stored figures too: a 350 kPa min over the stored 300 kPa max.
    await request(api.app)
      .patch(`/api/machines/${made.body.id}`)
      .set(as(api, 'owner'))
      .send({ fuelPressureMaxKpa: 300 })
      .expect(200);
    await request(api.app)
      .patch(`/api/machines/${made.body.id}`)
      .set(as(api, 'owner'))
      .send({ fuelPressureMinKpa: 350 })
      .expect(400);
  });
});

describe('machines: records', () => {
  it('creates only for a customer of this business, and refuses unknown fields', async () => {
    const before = await machineCount();
    await newMachine({ customerId: 999_999 }).expect(400);
    await newMachine({ colour: 'red' }).expect(400);
    await newMachine({ kind: 'tractor' }).expect(400);
    await newMachine({ meterUnit: 'furlong' }).expect(400);
    await newMachine({ make: '' }).expect(400);
    await request(api.app).post('/api/machines').set(as(api, 'owner')).send([]).expect(400);
    expect(await machineCount()).toBe(before);
  });

  it('filters by customer, searches make, model, VIN and other id, and pages without repeats', async () => {
    const byCustomer = await request(api.app)
      .get('/api/machines')
      .query({ customerId: julesId })
      .set(as(api, 'owner'))
      .expect(200);
    const ofJules = await api.database.db.select().from(t.machines).where(eq(t.machines.customerId, julesId));
    expect(byCustomer.body.items.map((m: { id: number }) => m.id).sort()).toEqual(
      ofJules.map((m) => m.id).sort(),
    );

    const seeded = ofJules[0]!;
    for (const q of [seeded.vin!.slice(3, 12).toLowerCase(), 'sKIMmer', 'tyl22-00']) {
      const found = await request(api.app)
        .get('/api/machines')
        .query({ q })
        .set(as(api, 'owner'))
        .expect(200);
      expect(found.body.items.length).toBeGreaterThan(0);
      for (const m of found.body.items) {
        expect(`${m.make} ${m.model} ${m.vin} ${m.otherId}`.toLowerCase()).toContain(q.toLowerCase());
      }
    }
    const none = await request(api.app)
      .get('/api/machines')
      .query({ q: '%' })
      .set(as(api, 'owner'))
      .expect(200);
    expect(none.body.items).toEqual([]);

    const seen: number[] = [];
    let cursor: string | null = null;
    do {
      const response = await request(api.app)
        .get('/api/machines')
        .query({ limit: 5, ...(cursor ? { cursor } : {}) })
        .set(as(api, 'bookkeeper'))
        .expect(200);
      const page = MachineListSchema.parse(response.body);
      seen.push(...page.items.map((m) => m.id));
      cursor = page.nextCursor;
    } while (cursor);
    const active = await api.database.db
      .select({ n: count() })
      .from(t.machines)
      .where(sql`${t.machines.archivedAt} is null`);
    expect(seen.length).toBe(active[0]!.n);
    expect(new Set(seen).size).toBe(seen.length);
    expect([...seen].sort((a, b) => b - a)).toEqual(seen);
  });

  it('archives on delete with an audit row; archived machines are listed only when asked', async () => {
    const made = await newMachine({ model: 'Archive Me 250' }).expect(201);
    await request(api.app).delete(`/api/machines/${made.body.id}`).set(as(api, 'helper')).expect(403);
    await request(api.app).delete(`/api/machines/${made.body.id}`).set(as(api, 'owner')).expect(204);
    const audit = await api.database.db
      .select()
      .from(t.auditEvents)
      .where(
        and(eq(t.auditEvents.action, 'machine.archived'), eq(t.auditEvents.entityId, String(made.body.id))),
      );
    expect(audit).toHaveLength(1);
    const active = await request(api.app)
      .get('/api/machines')
      .query({ q: 'Archive Me' })
      .set(as(api, 'owner'));
    expect(active.body.items).toEqual([]);
    const all = await request(api.app)
      .get('/api/machines')
      .query({ q: 'Archive Me', archived: 'true' })
      .set(as(api, 'owner'));
    expect(all.body.items.map((m: { id: number }) => m.id)).toEqual([made.body.id]);
    const kept = await request(api.app)
      .get(`/api/machines/${made.body.id}`)
      .set(as(api, 'owner'))
      .expect(200);
    expect(kept.body.archivedAt).toBe(api.clock.now.toISOString());
    await request(api.app).delete(`/api/machines/${made.body.id}`).set(as(api, 'owner')).expect(404);
  });

  it('refuses to change the meter unit once readings in it are recorded', async () => {
    const [seeded] = await api.database.db
      .select()
      .from(t.machines)
      .where(eq(t.machines.customerId, julesId));
    const refused = await request(api.app)
      .patch(`/api/machines/${seeded!.id}`)
      .set(as(api, 'owner'))
      .send({ meterUnit: seeded!.meterUnit === 'km' ? 'mi' : 'km' })
      .expect(409);
    expect(refused.body.error.message).toContain(seeded!.meterUnit);
    const fresh = await newMachine({ meterUnit: 'mi', meterReading: 120 }).expect(201);
    expect(fresh.body.meterReadAt).toBe(api.clock.now.toISOString());
    const corrected = await request(api.app)
      .patch(`/api/machines/${fresh.body.id}`)
      .set(as(api, 'owner'))
      .send({ meterUnit: 'km' })
      .expect(200);
    expect(corrected.body.meterUnit).toBe('km');
  });
});

describe('machines: customers and history', () => {
  it("shows a customer only their own machines, without staff notes, and 404 for another's", async () => {
    const list = await request(api.app).get('/api/machines').set(as(api, 'customer')).expect(200);
    const own = await api.database.db.select().from(t.machines).where(eq(t.machines.customerId, julesId));
    expect(list.body.items.length).toBe(own.length);
    for (const m of list.body.items) {
      expect(m.customerId).toBe(julesId);
      expect(m.notes).toBeNull();
    }
    // Asking for another customer's machines by filter gives nothing, not their rows.
    const sneaky = await request(api.app)
      .get('/api/machines')
      .query({ customerId: rowanId })
      .set(as(api, 'customer'))
      .expect(200);
    expect(sneaky.body.items).toEqual([]);
    const [rowans] = await api.database.db
      .select()
      .from(t.machines)
      .where(eq(t.machines.customerId, rowanId));
    await request(api.app).get(`/api/machines/${rowans!.id}`).set(as(api, 'customer')).expect(404);
    await request(api.app).get(`/api/machines/${rowans!.id}/history`).set(as(api, 'customer')).expect(404);
  });

  it('keeps staff notes from the customer', async () => {
    const [mine] = await api.database.db.select().from(t.machines).where(eq(t.machines.customerId, julesId));
    await request(api.app)
      .patch(`/api/machines/${mine!.id}`)
      .set(as(api, 'owner'))
      .send({ notes: 'Owner rides it hard; check the chain.' })
      .expect(200);
    const staff = await request(api.app).get(`/api/machines/${mine!.id}`).set(as(api, 'helper')).expect(200);
    expect(staff.body.notes).toBe('Owner rides it hard; check the chain.');
    const customer = await request(api.app)
      .get(`/api/machines/${mine!.id}`)
      .set(as(api, 'customer'))
      .expect(200);
    expect(customer.body.notes).toBeNull();
  });

  it('gives the whole service history, newest first, with every check run of each job', async () => {
    const [mine] = await api.database.db.select().from(t.machines).where(eq(t.machines.customerId, julesId));
    const response = await request(api.app)
      .get(`/api/machines/${mine!.id}/history`)
      .set(as(api, 'customer'))
      .expect(200);
    const history = MachineHistorySchema.parse(response.body);
    const jobs = await api.database.db.select().from(t.jobs).where(eq(t.jobs.machineId, mine!.id));
    expect(history.jobs.map((j) => j.id).sort()).toEqual(jobs.map((j) => j.id).sort());
    const when = (j: { scheduledAt: string | null }) => j.scheduledAt ?? '';
    expect(history.jobs.map(when)).toEqual(history.jobs.map(when).sort().reverse());

    const runs = await api.database.db
      .select()
      .from(t.checkRuns)
      .innerJoin(t.jobs, eq(t.jobs.id, t.checkRuns.jobId))
      .where(eq(t.jobs.machineId, mine!.id));
    expect(runs.length).toBeGreaterThan(0);
    expect(history.jobs.flatMap((j) => j.checks).length).toBe(runs.length);
    for (const { check_runs: run } of runs) {
      const job = history.jobs.find((j) => j.id === run.jobId)!;
      expect(job.checks).toContainEqual({
        id: run.id,
        procedureKey: run.procedureKey,
        status: run.status,
        verdict: run.verdict,
        startedAt: run.startedAt.toISOString(),
        finishedAt: run.finishedAt ? run.finishedAt.toISOString() : null,
      });
    }
    const done = history.jobs.find((j) => j.status === 'paid')!;
    const row = jobs.find((j) => j.id === done.id)!;
    expect(done).toMatchObject({
      complaint: row.complaint,
      diagnosis: row.diagnosis,
      workDone: row.workDone,
      meterReading: row.meterReading,
      completedAt: row.completedAt!.toISOString(),
    });
  });

  it('answers an empty history for a machine with no jobs yet', async () => {
    const made = await newMachine({ model: 'Brand New 125' }).expect(201);
    const response = await request(api.app)
      .get(`/api/machines/${made.body.id}/history`)
      .set(as(api, 'bookkeeper'))
      .expect(200);
    expect(response.body).toEqual({ machineId: made.body.id, meterUnit: 'mi', jobs: [] });
  });
});
