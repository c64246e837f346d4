import { auditLog } from '@/db/schema';
import type { DbOrTx } from '@/db/client';

export interface AuditEntry {
  storeId: string | null;
  actorUserId: string | null;
  action: string;
  entity: string;
  entityId: string;
  before?: unknown;
  after?: unknown;
}

/** Appends one row to the audit log; call it inside the same transaction as the change it records. */
export async function recordAudit(db: DbOrTx, entry: AuditEntry): Promise<void> {
  await db.insert(auditLog).values({
    storeId: entry.storeId,
    actorUserId: entry.actorUserId,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId,
    before: entry.before === undefined ? null : redact(entry.before),
    after: entry.after === undefined ? null : redact(entry.after),
  });
}

const SECRET_FIELDS = new Set(['passwordHash', 'password', 'password_hash']);

function redact(value: unknown): unknown {
  if (value === null || typeof value !== 'object') return value;
  if (Array.isArray(value)) return value.map(redact);
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value)) out[k] = SECRET_FIELDS.has(k) ? '[redacted]' : redact(v);
  return out;
}
