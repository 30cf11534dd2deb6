import type { Sequelize } from 'sequelize';
import { AuditEntry } from './audit-entry';
import { User } from './user';
import { Workshop } from './workshop';

export { AuditEntry, User, Workshop };

let boundTo: Sequelize | undefined;

/** Binds every model to the connection (once per process: models are module-level classes). */
export function initModels(sequelize: Sequelize): void {
  if (boundTo === sequelize) return;
  if (boundTo) throw new Error('models are already bound to another connection');
  for (const model of [User, Workshop, AuditEntry]) model.initModel(sequelize);
  boundTo = sequelize;
}
