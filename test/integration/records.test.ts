import { describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { auditLog, payments, photos, ticketLines, tickets } from '@/db/schema';
import { recordAudit } from '@/features/audit/audit.server';
import { getTicket, payTicket } from '@/features/counter/tickets.server';
import { ownerTestDb, pgError, testDb, unique } from '../support/db';
import { makeCounterWorld, setSpots, type CounterWorld } from '../support/counter';
import { acceptedTicket } from '../support/tickets';

// The application's role (DATABASE_URL) and the owner role that runs migrations.
const db = testDb();
const owner = ownerTestDb();

const PRIVILEGE = '42501';
/** A record on file refused a change (raised by the triggers of migration 0006). */
const ON_RECORD = '23R01';
/** A permitted change to a record on file came without an audit row in its transaction. */
const UNAUDITED = '23R02';

async function paidTicket(world: CounterWorld) {
  const t = await acceptedTicket(db, world);
  await payTicket(db, world.clerk, t.id, { method: 'check', checkNumber: unique('CHK').slice(0, 12) });
  const [photo] = await db
    .insert(photos)
    .values({
      storeId: world.storeId,
      kind: 'item',
      ticketId: t.id,
      objectKey: `stores/${world.storeId}/item/${unique('p')}.jpg`,
      contentType: 'image/jpeg',
      byteSize: 1234,
      sha256: 'a'.repeat(64),
      uploadedBy: world.clerk.id,
    })
    .returning();
  const view = await getTicket(db, world.clerk, t.id);
  expect(view.state).toBe('paid');
  return { ...view, photo: photo! };
}

async function world() {
  const w = await makeCounterWorld(db);
  await setSpots(db, w, { gold: '2400.00', silver: '30.00' });
  return w;
}

describe('the application connects as a role that cannot change the rules', () => {
  it('cannot switch a trigger off: it owns no table', async () => {
    for (const table of ['audit_log', 'tickets', 'ticket_lines', 'payments', 'photos']) {
      const refused = await pgError(() => db.execute(sql.raw(`alter table ${table} disable trigger user`)));
      if (refused.code === 'ok') await db.execute(sql.raw(`alter table ${table} enable trigger user`));
      expect(refused, table).toMatchObject({ code: PRIVILEGE, message: expect.stringMatching(/must be owner/) });
    }
  });

  it('cannot turn triggers off for its session: it is not a superuser', async () => {
    const refused = await pgError(() => db.transaction(async (tx) => tx.execute(sql`set local session_replication_role = replica`)));
    expect(refused).toMatchObject({ code: PRIVILEGE, message: expect.stringMatching(/permission denied to set parameter/) });
    const [role] = await db.execute<{ rolsuper: boolean; rolcreaterole: boolean; rolcreatedb: boolean; rolbypassrls: boolean; rolreplication: boolean }>(
      sql`select rolsuper, rolcreaterole, rolcreatedb, rolbypassrls, rolreplication from pg_roles where rolname = current_user`,
    );
    expect(role).toEqual({ rolsuper: false, rolcreaterole: false, rolcreatedb: false, rolbypassrls: false, rolreplication: false });
  });

  it('runs no DDL: no new tables, no dropped ones, no triggers of its own', async () => {
    const name = `scratch_${unique('t').toLowerCase()}`;
    expect(await pgError(() => db.execute(sql.raw(`create table ${name} (a int)`)))).toMatchObject({ code: PRIVILEGE });
    expect(await pgError(() => db.execute(sql.raw(`create table pg_temp.${name} (a int)`)))).toMatchObject({ code: PRIVILEGE });
    expect(await pgError(() => db.execute(sql`drop table photos`))).toMatchObject({ code: PRIVILEGE });
    expect(await pgError(() => db.execute(sql`alter table tickets add column scratch int`))).toMatchObject({ code: PRIVILEGE });
    expect(await pgError(() => db.execute(sql`create trigger scratch before update on tickets for each row execute function audit_log_refuse_change()`))).toMatchObject({
      code: PRIVILEGE,
    });
  });

  it('may only read and append to the audit log: update, delete and truncate are refused for want of the right', async () => {
    const w = await world();
    await recordAudit(db, { storeId: w.storeId, actorUserId: null, action: 'test.append', entity: 'store', entityId: w.storeId });
    const [row] = await db.select().from(auditLog).where(eq(auditLog.entityId, w.storeId));
    const [rights] = await db.execute<Record<string, boolean>>(sql`select
      has_table_privilege(current_user, 'audit_log', 'SELECT') as "select",
      has_table_privilege(current_user, 'audit_log', 'INSERT') as "insert",
      has_table_privilege(current_user, 'audit_log', 'UPDATE') as "update",
      has_table_privilege(current_user, 'audit_log', 'DELETE') as "delete",
      has_table_privilege(current_user, 'audit_log', 'TRUNCATE') as "truncate",
      has_table_privilege(current_user, 'audit_log', 'TRIGGER') as "trigger"`);
    expect(rights).toEqual({ select: true, insert: true, update: false, delete: false, truncate: false, trigger: false });
    const permissionDenied = { code: PRIVILEGE, message: expect.stringMatching(/permission denied for table audit_log/) };
    expect(await pgError(() => db.execute(sql`delete from audit_log where id = ${row!.id}`))).toMatchObject(permissionDenied);
    expect(await pgError(() => db.execute(sql`update audit_log set action = 'test.changed' where id = ${row!.id}`))).toMatchObject(permissionDenied);
    expect(await pgError(() => db.execute(sql`truncate audit_log`))).toMatchObject(permissionDenied);
    const [still] = await db.select().from(auditLog).where(eq(auditLog.id, row!.id));
    expect(still).toEqual(row);
  });
});

describe('accepted, paid and voided tickets are on the record', () => {
  it('refuses a change to a paid ticket\u2019s line figures', async () => {
    const t = await paidTicket(await world());
    const line = t.lines[0]!;
    const refused = await pgError(() =>
      db.execute(sql`update ticket_lines set payout_minor = payout_minor - 100, margin_minor = margin_minor + 100 where id = ${line.id}`),
    );
    expect(refused).toMatchObject({ code: ON_RECORD, message: expect.stringMatching(/margin_minor, payout_minor/) });
    expect(await pgError(() => db.update(ticketLines).set({ netWeightGrams: '1.0000' }).where(eq(ticketLines.id, line.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(ticketLines).set({ tagNumber: 'HBR-OTHER-01' }).where(eq(ticketLines.id, line.id)))).toMatchObject({ code: ON_RECORD });
    const [after] = await db.select().from(ticketLines).where(eq(ticketLines.id, line.id));
    expect(after).toEqual(line);
  });

  it('refuses a change to a paid ticket\u2019s payout total, its seller or its signature', async () => {
    const w = await world();
    const t = await paidTicket(w);
    expect(await pgError(() => db.execute(sql`update tickets set payout_minor = payout_minor + 5000, melt_value_minor = melt_value_minor + 5000 where id = ${t.id}`))).toMatchObject({
      code: ON_RECORD,
      message: expect.stringMatching(/melt_value_minor, payout_minor/),
    });
    expect(await pgError(() => db.update(tickets).set({ signatureSvg: '<svg/>' }).where(eq(tickets.id, t.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(tickets).set({ holdUntil: '2000-01-01' }).where(eq(tickets.id, t.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(tickets).set({ state: 'accepted' }).where(eq(tickets.id, t.id)))).toMatchObject({ code: ON_RECORD });
    const [after] = await db.select().from(tickets).where(eq(tickets.id, t.id));
    expect(after!.payoutMinor).toBe(t.payoutMinor);
    expect(after!.updatedAt).toEqual(t.updatedAt);
  });

  it('refuses deleting a photo of a paid ticket, and changing where it points', async () => {
    const t = await paidTicket(await world());
    expect(await pgError(() => db.delete(photos).where(eq(photos.id, t.photo.id)))).toMatchObject({ code: PRIVILEGE });
    // The owner role has every right on its tables, and the trigger still refuses.
    expect(await pgError(() => owner.delete(photos).where(eq(photos.id, t.photo.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(photos).set({ sha256: 'b'.repeat(64) }).where(eq(photos.id, t.photo.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(photos).set({ ticketId: null, sellerId: t.sellerId }).where(eq(photos.id, t.photo.id)))).toMatchObject({ code: ON_RECORD });
    const [still] = await db.select().from(photos).where(eq(photos.id, t.photo.id));
    expect(still).toEqual(t.photo);
  });

  it('refuses removing or adding lines, deleting the ticket, and rewriting or deleting its payment', async () => {
    const t = await paidTicket(await world());
    const payment = t.payments[0]!;
    expect(await pgError(() => db.delete(ticketLines).where(eq(ticketLines.id, t.lines[0]!.id)))).toMatchObject({ code: ON_RECORD });
    expect(
      await pgError(() =>
        db.insert(ticketLines).values({ ticketId: t.id, storeId: t.storeId, position: 9, input: {}, description: 'an extra line', payoutMinor: 0 }),
      ),
    ).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.delete(tickets).where(eq(tickets.id, t.id)))).toMatchObject({ code: PRIVILEGE });
    expect(await pgError(() => owner.delete(tickets).where(eq(tickets.id, t.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(payments).set({ amountMinor: payment.amountMinor + 1 }).where(eq(payments.id, payment.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(payments).set({ checkNumber: '000' }).where(eq(payments.id, payment.id)))).toMatchObject({ code: ON_RECORD });
    expect(await pgError(() => db.update(payments).set({ state: 'failed', failureReason: 'changed my mind' }).where(eq(payments.id, payment.id)))).toMatchObject({
      code: ON_RECORD,
    });
    expect(await pgError(() => db.delete(payments).where(eq(payments.id, payment.id)))).toMatchObject({ code: PRIVILEGE });
    expect(await pgError(() => owner.delete(payments).where(eq(payments.id, payment.id)))).toMatchObject({ code: ON_RECORD });
    const [again] = await db.select().from(payments).where(eq(payments.id, payment.id));
    expect(again).toEqual(payment);
    expect(await db.select().from(ticketLines).where(eq(ticketLines.ticketId, t.id))).toHaveLength(t.lines.length);
  });

  it('refuses the same rewrites from the owner role: the triggers bind the migrations\u2019 role too', async () => {
    const t = await paidTicket(await world());
    expect(await pgError(() => owner.update(ticketLines).set({ payoutMinor: 1, marginMinor: t.lines[0]!.meltValueMinor - 1 }).where(eq(ticketLines.id, t.lines[0]!.id)))).toMatchObject({
      code: ON_RECORD,
    });
    expect(await pgError(() => owner.update(tickets).set({ payoutMinor: 1, marginMinor: t.meltValueMinor - 1 }).where(eq(tickets.id, t.id)))).toMatchObject({ code: ON_RECORD });
  });

  it('lets through a permitted state change only with an audit row written in the same transaction', async () => {
    const w = await world();
    const t = await paidTicket(w);
    const voidIt = (tx: Parameters<Parameters<typeof db.transaction>[0]>[0]) =>
      tx.update(tickets).set({ state: 'voided', voidedAt: new Date(), voidedBy: w.manager.id, voidReason: 'by hand' }).where(eq(tickets.id, t.id));
    expect(await pgError(() => db.transaction(async (tx) => voidIt(tx)))).toMatchObject({ code: UNAUDITED });
    expect((await getTicket(db, w.clerk, t.id)).state).toBe('paid');
    await db.transaction(async (tx) => {
      await voidIt(tx);
      await recordAudit(tx, { storeId: w.storeId, actorUserId: w.manager.id, action: 'ticket.void', entity: 'ticket', entityId: t.id, after: { state: 'voided' } });
    });
    expect((await getTicket(db, w.clerk, t.id)).state).toBe('voided');
    // Voided is final.
    expect(await pgError(() => db.update(tickets).set({ voidReason: 'another reason' }).where(eq(tickets.id, t.id)))).toMatchObject({ code: ON_RECORD });
  });

  it('leaves a ticket still being graded free to change', async () => {
    const w = await world();
    const [row] = await db
      .insert(tickets)
      .values({ storeId: w.storeId, number: 999, sellerId: w.sellerId, clerkId: w.clerk.id, currency: 'USD' })
      .returning();
    const [line] = await db
      .insert(ticketLines)
      .values({ ticketId: row!.id, storeId: w.storeId, position: 1, input: {}, description: 'ring', meltValueMinor: 100, payoutMinor: 80, marginMinor: 20 })
      .returning();
    await db.update(ticketLines).set({ payoutMinor: 90, marginMinor: 10 }).where(eq(ticketLines.id, line!.id));
    await db.update(tickets).set({ payoutMinor: 90, meltValueMinor: 100, marginMinor: 10 }).where(eq(tickets.id, row!.id));
    await db.delete(ticketLines).where(eq(ticketLines.id, line!.id));
    const [after] = await db.select().from(tickets).where(eq(tickets.id, row!.id));
    expect(after!.payoutMinor).toBe(90);
  });
});

describe('the audit log is a hash chain', () => {
  it('chains every new row to the one before it, and the chain verifies', async () => {
    const w = await world();
    for (let i = 0; i < 3; i++) {
      await recordAudit(db, { storeId: w.storeId, actorUserId: null, action: 'test.chain', entity: 'store', entityId: w.storeId, after: { i } });
    }
    const rows = await db.execute<{ position: string; prev_hash: string; hash: string; input: string }>(sql`
      select c.position, c.prev_hash, c.hash, audit_chain_input(a) as input
      from audit_chain c join audit_log a on a.id = c.audit_id
      where a.entity_id = ${w.storeId} order by c.position`);
    expect(rows).toHaveLength(3);
    const { createHash } = await import('node:crypto');
    for (const r of rows) {
      expect(r.hash).toBe(createHash('sha256').update(`${r.prev_hash}|${r.position}|${r.input}`).digest('hex'));
      const [before] = await db.execute<{ hash: string }>(sql`select hash from audit_chain where position = ${Number(r.position) - 1}`);
      expect(r.prev_hash).toBe(before!.hash);
    }
    expect(await db.execute(sql`select * from audit_chain_breaks()`)).toEqual([]);
    // The application cannot write the chain itself.
    expect(await pgError(() => db.execute(sql`insert into audit_chain (position, audit_id, prev_hash, hash) values (0, 0, '', '')`))).toMatchObject({ code: PRIVILEGE });
  });
});
