/** The audit log as the owner reads it. */
import { z } from 'zod';
import { DATE_RULES, dateSchema } from './dates';

/** Entity types written by the services, with the words the log page shows. */
export const AUDIT_ENTITY_LABELS: Record<string, string> = {
  material: 'Material',
  pack: 'Pack',
  'pack-price': 'Pack price',
  'price-file': 'Supplier price file',
  'labour-rate': 'Labour rate',
  workshop: 'Workshop settings',
  'finishing-system': 'Finishing system',
  species: 'Wood species',
  user: 'User',
  customer: 'Customer',
  piece: 'Piece',
  estimate: 'Estimate',
  quote: 'Quote',
  job: 'Job',
  polisher: 'Polisher',
  photo: 'Photo',
};

export const AuditQuerySchema = z
  .object({
    entityType: z.string().trim().regex(/^[a-z-]{1,60}$/, { message: 'must be an entity type such as pack-price' }).optional(),
    userId: z.coerce.number().int().positive().max(2_147_483_647).optional(),
    from: dateSchema(DATE_RULES.auditFilter).optional(),
    to: dateSchema(DATE_RULES.auditFilter).optional(),
    dir: z.enum(['asc', 'desc']).default('desc'),
    sort: z.enum(['at']).default('at'),
    page: z.coerce.number().int().min(1).max(100_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(100).default(25),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: 'must be on or after the from date', path: ['to'] });
export type AuditQuery = z.infer<typeof AuditQuerySchema>;

export interface AuditEntryDto {
  id: string;
  at: string;
  userId: number | null;
  userName: string | null;
  action: string;
  entityType: string;
  entityId: string | null;
  /** The record as people name it (EST-…, Q-…, JOB-…, a customer's or material's name) and its page; null once gone. */
  subject: { label: string; path: string } | null;
  before: unknown;
  after: unknown;
}

export interface AuditFilters {
  entityTypes: string[];
  users: { id: number; name: string }[];
}
