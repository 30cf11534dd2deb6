/** Finishing systems and wood species as the owner edits them (the engine's own shapes live in catalog.ts). */
import { z } from 'zod';
import { SpeciesSchema, StageSchema, type PORES, type Stage } from './catalog';

export interface FinishingSystemDto {
  id: number;
  key: string;
  name: string;
  description: string;
  stages: Stage[];
  preset: boolean;
  archived: boolean;
  updatedAt: string;
}

export const SystemListQuerySchema = z.object({ archived: z.enum(['active', 'archived', 'all']).default('active') });

/** Stage keys must be unique within a system: the estimate refers to them. */
export const SystemUpdateSchema = z
  .object({
    name: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(80),
    description: z.string().trim().max(500, { message: 'must be at most 500 characters' }).default(''),
    stages: z.array(StageSchema).min(1, { message: 'needs at least one stage' }).max(40),
  })
  .strict()
  .superRefine((s, ctx) => {
    const seen = new Set<string>();
    s.stages.forEach((stage, i) => {
      if (seen.has(stage.key)) ctx.addIssue({ code: 'custom', path: ['stages', i, 'key'], message: `duplicate stage key "${stage.key}"` });
      seen.add(stage.key);
    });
  });
export type SystemUpdateInput = z.input<typeof SystemUpdateSchema>;

export const CopySystemSchema = z
  .object({
    fromId: z.number({ message: 'is required' }).int().positive(),
    name: z.string({ message: 'is required' }).trim().min(1, { message: 'is required' }).max(80),
  })
  .strict();
export type CopySystemInput = z.input<typeof CopySystemSchema>;

export const ArchiveSchema = z.object({ archived: z.boolean({ message: 'must be true or false' }) }).strict();

export interface SpeciesDto {
  id: number;
  key: string;
  name: string;
  pores: (typeof PORES)[number];
  needsGrainFill: boolean;
  absorbency: number;
  archived: boolean;
  updatedAt: string;
}

export const SpeciesListQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  archived: z.enum(['active', 'archived', 'all']).default('active'),
  sort: z.enum(['name', 'pores', 'absorbency']).default('name'),
  dir: z.enum(['asc', 'desc']).default('asc'),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type SpeciesListQuery = z.infer<typeof SpeciesListQuerySchema>;

export const CreateSpeciesSchema = SpeciesSchema.extend({ key: SpeciesSchema.shape.key.optional() }).strict();
export type CreateSpeciesInput = z.input<typeof CreateSpeciesSchema>;

export const UpdateSpeciesSchema = SpeciesSchema.omit({ key: true }).partial().extend({ archived: z.boolean().optional() }).strict();
export type UpdateSpeciesInput = z.input<typeof UpdateSpeciesSchema>;

/** A lower-case key from a name: "Brazilian Rosewood" → "brazilian-rosewood". */
export function keyFromName(name: string): string {
  const k = name
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 56);
  return k || 'item';
}
