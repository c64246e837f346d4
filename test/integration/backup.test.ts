import { afterAll, describe, expect, it } from 'vitest';
import { execFile } from 'node:child_process';
import { rm } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { eq, sql } from 'drizzle-orm';
import { createDb, type DbHandle } from '@/db/client';
import { auditLog, tickets } from '@/db/schema';
import { recordAudit } from '@/features/audit/audit.server';
import { payTicket } from '@/features/counter/tickets.server';
import { createPhotoStorage, storePhoto } from '@/features/photos/photos.server';
import { ownerTestDb, pgError, testDb, unique } from '../support/db';
import { makeCounterWorld, setSpots, type CounterWorld } from '../support/counter';
import { acceptedTicket } from '../support/tickets';

const db = testDb();
const owner = ownerTestDb();
const storage = createPhotoStorage();
afterAll(() => storage.client.destroy());

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const PNG = new Uint8Array(Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==', 'base64'));

/** The documented command itself, pointed at the test cluster this run is using. */
async function startScript(args: string[]) {
  const port = new URL(process.env.DATABASE_URL!).port;
  try {
    const { stdout, stderr } = await promisify(execFile)(`${ROOT}/docker-free-start.sh`, args, {
      cwd: ROOT,
      env: { ...process.env, CUPEL_TARGET: 'test', TEST_PG_PORT: port, NO_COLOR: '1' },
      timeout: 180_000,
      maxBuffer: 16 * 1024 * 1024,
    });
    return { code: 0, stdout, stderr };
  } catch (err) {
    const e = err as { code?: number; stdout?: string; stderr?: string };
    return { code: e.code ?? 1, stdout: e.stdout ?? '', stderr: e.stderr ?? '' };
  }
}

function urlFor(base: string, database: string): string {
  const u = new URL(base);
  u.pathname = `/${database}`;
  return u.toString();
}

/** One seller's visit: accepted, an item photo, paid by check. Every step is its own transaction. */
async function sale(world: CounterWorld, steps: number[]) {
  const t = await acceptedTicket(db, world);
  steps.push(Date.now());
  await storePhoto(db, world.clerk, { storeId: world.storeId, kind: 'item', ticketId: t.id, bytes: PNG }, storage);
  steps.push(Date.now());
  await payTicket(db, world.clerk, t.id, { method: 'check', checkNumber: unique('C').slice(0, 10) });
  steps.push(Date.now());
  return t.id;
}

type Row = Record<string, unknown>;
async function rows(handle: { execute: DbHandle['db']['execute'] }, query: ReturnType<typeof sql>): Promise<Row[]> {
  return (await handle.execute(query)) as unknown as Row[];
}
const byId = (list: Row[], key = 'id') => new Map(list.map((r) => [String(r[key]), r]));

// Columns of a ticket that never change once it is on the record (see migration 0006).
const MOVING_TICKET_COLUMNS = ['state', 'paid_at', 'hold_until', 'voided_at', 'voided_by', 'void_reason', 'updated_at'];

describe('backup and restore', () => {
  it('restores a backup taken while writes go on into a fresh database: every record there, the audit chain intact', async () => {
    const world = await makeCounterWorld(db);
    await setSpots(db, world, { gold: '2400.00', silver: '30.00' });
    const steps: number[] = [];
    for (let i = 0; i < 3; i++) await sale(world, steps);

    // A transaction that has written but not committed when the backup starts, and commits after it.
    let releaseInFlight!: () => void;
    const backupDone = new Promise<void>((resolve) => (releaseInFlight = resolve));
    const inFlightEntity = unique('inflight');
    let inFlightWritten!: () => void;
    const written = new Promise<void>((resolve) => (inFlightWritten = resolve));
    const inFlight = db.transaction(async (tx) => {
      await recordAudit(tx, { storeId: world.storeId, actorUserId: world.clerk.id, action: 'test.in-flight', entity: 'store', entityId: inFlightEntity });
      inFlightWritten();
      await backupDone;
    });
    await written;

    // Sales go on, one after another, through the backup.
    let stop = false;
    const writer = (async () => {
      for (let i = 0; i < 200 && !stop; i++) await sale(world, steps);
    })();
    while (steps.length < 12) await new Promise((r) => setTimeout(r, 20));

    // Everything committed before the backup starts must be in it.
    const before = {
      tickets: (await rows(owner, sql`select id from tickets`)).map((r) => String(r.id)),
      payments: (await rows(owner, sql`select id from payments`)).map((r) => String(r.id)),
      photos: (await rows(owner, sql`select id from photos`)).map((r) => String(r.id)),
      chain: Number((await rows(owner, sql`select coalesce(max(position), 0) as n from audit_chain`))[0]!.n),
    };
    // pg_dump takes its snapshot first, then a share lock on each table. A table held locked here
    // keeps it waiting, snapshot taken, while the sales go on: those are written mid-backup for certain.
    const gate = `backup_gate_${unique('g').toLowerCase().replace(/[^a-z0-9]/g, '')}`;
    await owner.execute(sql.raw(`create table ${gate} (id int)`));
    let openGate!: () => void;
    const gateOpened = new Promise<void>((resolve) => (openGate = resolve));
    let gateLocked!: () => void;
    const locked = new Promise<void>((resolve) => (gateLocked = resolve));
    const gateHolder = owner.transaction(async (tx) => {
      await tx.execute(sql.raw(`lock table ${gate} in access exclusive mode`));
      gateLocked();
      await gateOpened;
    });
    await locked;
    const running = startScript(['backup']);
    let chainWhenDumpWaits = 0;
    try {
      let waiting = false;
      for (let i = 0; i < 600 && !waiting; i++) {
        await new Promise((r) => setTimeout(r, 50));
        // The owner sees its own sessions' wait events (pg_dump connects as the owner).
        const [dump] = await rows(owner, sql`select count(*)::int as n from pg_stat_activity where application_name = 'pg_dump' and wait_event_type = 'Lock'`);
        waiting = dump!.n === 1;
      }
      expect(waiting, 'pg_dump waits at the gate').toBe(true);
      chainWhenDumpWaits = Number((await rows(owner, sql`select coalesce(max(position), 0) as n from audit_chain`))[0]!.n);
      const stepsWhenDumpWaits = steps.length;
      while (steps.length < stepsWhenDumpWaits + 4) await new Promise((r) => setTimeout(r, 20));
    } finally {
      openGate();
      await gateHolder;
      await running;
      releaseInFlight();
      stop = true;
      await Promise.all([writer, inFlight]);
      await owner.execute(sql.raw(`drop table ${gate}`));
    }
    const backup = await running;
    expect(backup.code, backup.stderr).toBe(0);
    const file = backup.stdout.trim().split('\n').at(-1)!;
    expect(file).toMatch(/\/\.local\/backups\/cupel_test-\d{8}T\d{6}\.\d{3}Z\.dump$/);
    const chainAfterBackup = Number((await rows(owner, sql`select coalesce(max(position), 0) as n from audit_chain`))[0]!.n);

    const target = `cupel_test_restore_${unique('r').toLowerCase().replace(/[^a-z0-9]/g, '')}`;
    const restoredApp = createDb(urlFor(process.env.DATABASE_URL!, target), { max: 2 });
    const restoredOwner = createDb(urlFor(process.env.MIGRATION_DATABASE_URL!, target), { max: 1 });
    try {
      const restore = await startScript(['restore', file, '--into', target]);
      expect(restore.code, restore.stderr).toBe(0);
      expect(restore.stdout).toMatch(new RegExp(`restored ${target}: \\d+ tickets, \\d+ payments, \\d+ photo references, \\d+ audit rows; the audit chain verifies`));
      const r = restoredApp.db;
      const restored = {
        tickets: byId(await rows(r, sql`select * from tickets`)),
        payments: byId(await rows(r, sql`select * from payments`)),
        photos: byId(await rows(r, sql`select * from photos`)),
        lines: await rows(r, sql`select * from ticket_lines`),
        audit: byId(await rows(r, sql`select * from audit_log`)),
        chain: await rows(r, sql`select * from audit_chain order by position`),
      };

      // Every ticket, payment, photo reference and chained audit row committed before the backup.
      for (const id of before.tickets) expect(restored.tickets.has(id), `ticket ${id}`).toBe(true);
      for (const id of before.payments) expect(restored.payments.has(id), `payment ${id}`).toBe(true);
      for (const id of before.photos) expect(restored.photos.has(id), `photo ${id}`).toBe(true);
      expect(restored.chain.length).toBeGreaterThanOrEqual(before.chain);
      // ...and nothing committed while pg_dump was already at work, though those sales are live.
      expect(restored.chain.length).toBeLessThanOrEqual(chainWhenDumpWaits);
      expect(chainAfterBackup).toBeGreaterThan(chainWhenDumpWaits);

      // The audit chain is a whole prefix of the live one: same positions, rows and hashes, nothing missing.
      const liveChain = await rows(owner, sql`select * from audit_chain where position <= ${restored.chain.length} order by position`);
      expect(restored.chain).toEqual(liveChain);
      expect(restored.chain.map((c) => Number(c.position))).toEqual(restored.chain.map((_, i) => i + 1));
      expect(restored.audit.size).toBe(restored.chain.length);
      const liveAudit = byId(await rows(owner, sql`select * from audit_log where id in (select audit_id from audit_chain where position <= ${restored.chain.length})`));
      expect(restored.audit).toEqual(liveAudit);
      expect(await rows(r, sql`select * from audit_chain_breaks()`)).toEqual([]);

      // The transaction still open when the backup began is not in it, though it is live now.
      expect((await owner.select().from(auditLog).where(eq(auditLog.entityId, inFlightEntity))).length).toBe(1);
      expect([...restored.audit.values()].some((a) => a.entity_id === inFlightEntity)).toBe(false);

      // One snapshot: each sale is in the backup whole or not at all.
      const mine = [...restored.tickets.values()].filter((t) => t.store_id === world.storeId);
      expect(mine.filter((t) => t.state === 'paid').length).toBeGreaterThanOrEqual(3);
      const auditOf = (id: string) => [...restored.audit.values()].filter((a) => a.entity_id === id).map((a) => a.action);
      for (const t of mine) {
        const id = String(t.id);
        const pays = [...restored.payments.values()].filter((p) => p.ticket_id === id);
        const lines = restored.lines.filter((l) => l.ticket_id === id);
        const actions = auditOf(id);
        // The sale's steps, each its own transaction: the state, the lines and the audit agree on how far it got.
        const reached = { draft: 1, quoted: 2, accepted: 3, paid: 4 }[String(t.state)];
        expect(reached, `state of ${id}`).toBeDefined();
        expect(actions.includes('ticket.lines-save')).toBe(lines.length > 0);
        expect(actions.includes('ticket.quote')).toBe(reached! >= 2);
        expect(actions.includes('ticket.accept')).toBe(reached! >= 3);
        expect(lines.length).toBe(reached! >= 2 ? 3 : lines.length);
        if (t.state === 'paid') {
          expect(pays.map((p) => [p.kind, p.state, Number(p.amount_minor)])).toEqual([['payout', 'completed', Number(t.payout_minor)]]);
          expect(lines.every((l) => l.tag_number && String(l.hold_until) === String(t.hold_until))).toBe(true);
          expect(actions.filter((a) => a === 'ticket.pay')).toHaveLength(1);
        } else {
          expect(pays).toEqual([]);
          expect(actions).not.toContain('ticket.pay');
          expect(lines.every((l) => l.tag_number === null)).toBe(true);
        }
      }
      for (const p of restored.payments.values()) expect(restored.tickets.has(String(p.ticket_id))).toBe(true);
      for (const p of restored.photos.values()) expect(restored.tickets.has(String(p.ticket_id ?? '')) || p.seller_id !== null).toBe(true);
      const myPhotos = [...restored.photos.values()].filter((p) => p.store_id === world.storeId);
      // A sale's photo is taken before it is paid: every paid ticket has its photo, and no photo lacks its ticket.
      for (const p of myPhotos) expect(mine.some((t) => t.id === p.ticket_id)).toBe(true);
      for (const t of mine.filter((t) => t.state === 'paid')) expect(myPhotos.filter((p) => p.ticket_id === t.id)).toHaveLength(1);
      for (const p of myPhotos) expect(auditOf(String(p.id))).toEqual(['photo.store']);

      // Records on file are identical to the live ones; photos and completed payments are too.
      const live = {
        tickets: byId(await rows(owner, sql`select * from tickets`)),
        payments: byId(await rows(owner, sql`select * from payments where state <> 'pending'`)),
        photos: byId(await rows(owner, sql`select * from photos`)),
      };
      const frozen = (row: Row) => Object.fromEntries(Object.entries(row).filter(([k]) => !MOVING_TICKET_COLUMNS.includes(k)));
      for (const t of restored.tickets.values()) {
        if (['accepted', 'paid', 'voided'].includes(String(t.state))) expect(frozen(t)).toEqual(frozen(live.tickets.get(String(t.id))!));
      }
      for (const p of restored.photos.values()) expect(p).toEqual(live.photos.get(String(p.id)));
      for (const p of restored.payments.values()) if (p.state !== 'pending') expect(p).toEqual(live.payments.get(String(p.id)));

      // The restored database keeps the rules: roles, rights and triggers came back with it.
      const paid = mine.find((t) => t.state === 'paid')!;
      expect(await pgError(() => r.execute(sql`update ticket_lines set payout_minor = 0, margin_minor = melt_value_minor where ticket_id = ${paid.id}`))).toMatchObject({
        code: '23R01',
      });
      expect(await pgError(() => r.execute(sql`delete from audit_log`))).toMatchObject({ code: '42501' });
      expect(await pgError(() => r.execute(sql`alter table tickets disable trigger user`))).toMatchObject({ code: '42501' });
      // ...and the chain goes on from where the backup ends.
      await recordAudit(r, { storeId: world.storeId, actorUserId: null, action: 'test.after-restore', entity: 'store', entityId: world.storeId });
      const [next] = await rows(r, sql`select c.position, c.prev_hash from audit_chain c join audit_log a on a.id = c.audit_id where a.action = 'test.after-restore'`);
      expect(Number(next!.position)).toBe(restored.chain.length + 1);
      expect(next!.prev_hash).toBe(restored.chain.at(-1)!.hash);

      // A row changed behind the triggers' back (only the owner can switch them off) breaks the chain where it was changed.
      const victim = restored.chain[Math.floor(restored.chain.length / 2)]!;
      await restoredOwner.db.transaction(async (tx) => {
        await tx.execute(sql`alter table audit_log disable trigger audit_log_no_update`);
        await tx.execute(sql`update audit_log set after = '{"payoutMinor": 1}' where id = ${victim.audit_id}`);
        await tx.execute(sql`alter table audit_log enable trigger audit_log_no_update`);
      });
      expect(await rows(r, sql`select * from audit_chain_breaks()`)).toEqual([
        { chain_position: victim.position, audit_id: victim.audit_id, problem: 'its audit row or its hash was changed' },
      ]);

      // A second restore into the same, now non-empty, database is refused and changes nothing.
      const count = Number((await rows(r, sql`select count(*) as n from tickets`))[0]!.n);
      const again = await startScript(['restore', file, '--into', target]);
      expect(again.code).not.toBe(0);
      expect(again.stderr).toMatch(new RegExp(`Database ${target} is not empty .*refusing to overwrite it`));
      expect(Number((await rows(r, sql`select count(*) as n from tickets`))[0]!.n)).toBe(count);
    } finally {
      await restoredApp.close();
      await restoredOwner.close();
      await owner.execute(sql.raw(`drop database if exists ${target} with (force)`));
      await rm(file, { force: true });
      await rm(`${file}.sha256`, { force: true });
    }
    // The live database is untouched by all this: every sale is still there.
    expect((await db.select().from(tickets).where(eq(tickets.storeId, world.storeId))).length).toBe(steps.filter((_, i) => i % 3 === 0).length);
  }, 240_000);
});
