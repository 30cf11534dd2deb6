import type { Transaction } from 'sequelize';
import { AuditEntry } from '../models';

export interface AuditInput {
  userId: number | null;
  action: string;
  entityType: string;
  entityId?: string | number | null;
  before?: unknown;
  after?: unknown;
}

/** Records who changed what, from what to what; written in the caller's transaction. */
export async function audit(entry: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditEntry.create(
    {
      userId: entry.userId,
      action: entry.action,
      entityType: entry.entityType,
      entityId: entry.entityId == null ? null : String(entry.entityId),
      before: entry.before ?? null,
      after: entry.after ?? null,
    },
    { transaction },
  );
}
