import "server-only";
import type { Executor } from "@/db/client";
import { auditLog } from "@/db/schema";

export interface AuditEntry {
  programId?: number | null;
  actorId?: number | null;
  /** Verb-shaped, e.g. "report.accepted", "tester.approved", "settings.updated". */
  action: string;
  entityType: string;
  entityId: string | number;
  before?: unknown;
  after?: unknown;
}

/**
 * Appends to the audit log inside the caller's transaction, so a change of state and its
 * record land together or not at all. The log is never updated or deleted.
 */
export async function recordAudit(executor: Executor, entry: AuditEntry): Promise<void> {
  await executor.insert(auditLog).values({
    programId: entry.programId ?? null,
    actorId: entry.actorId ?? null,
    action: entry.action,
    entityType: entry.entityType,
    entityId: String(entry.entityId),
    before: entry.before === undefined ? null : stripSecrets(entry.before),
    after: entry.after === undefined ? null : stripSecrets(entry.after),
    at: new Date(),
  });
}

const secretKeys = new Set(["passwordHash", "password", "tokenHash", "token"]);

function stripSecrets(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(stripSecrets);
  if (value && typeof value === "object" && !(value instanceof Date)) {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) if (!secretKeys.has(k)) out[k] = stripSecrets(v);
    return out;
  }
  return value;
}
