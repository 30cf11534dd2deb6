import type { MigrationContext } from '../db/migrator';

/**
 * Settings for measures a workshop relies on, and the overnight rest between bodying sessions:
 * - `settings.shellac.gallon`: the gallon a pound cut is measured against, 'us' (default) or 'uk';
 * - `settings.imperialVolumes`: whose pints and fluid ounces an imperial display shows, 'us' (default) or 'uk';
 * - the preset systems' bodying rest goes from 24 h to the overnight 12 h (Bitmead: about 12 h), so that bodying
 *   can go one session a working day. Only preset systems whose bodying rest is still the old 24 h are changed;
 *   an owner's own figure is left alone.
 */
export async function up({ sequelize }: MigrationContext): Promise<void> {
  await sequelize.query(`
    UPDATE workshops SET settings = jsonb_set(
      settings || jsonb_build_object('imperialVolumes', COALESCE(settings->'imperialVolumes', '"us"'::jsonb)),
      '{shellac,gallon}', COALESCE(settings#>'{shellac,gallon}', '"us"'::jsonb), true)
    WHERE settings ? 'shellac'`);
  await setBodyRest(sequelize, 24, 12);
}

export async function down({ sequelize }: MigrationContext): Promise<void> {
  await setBodyRest(sequelize, 12, 24);
  await sequelize.query(`UPDATE workshops SET settings = (settings - 'imperialVolumes') #- '{shellac,gallon}'`);
}

/** Sets the rest of the 'body' stage of the preset systems from one figure to another. */
async function setBodyRest(sequelize: MigrationContext['sequelize'], from: number, to: number): Promise<void> {
  await sequelize.query(
    `UPDATE finishing_systems SET stages = (
       SELECT jsonb_agg(CASE WHEN s->>'key' = 'body' AND (s->>'restHours')::numeric = :from
                             THEN jsonb_set(s, '{restHours}', to_jsonb(:to::numeric)) ELSE s END ORDER BY i)
       FROM jsonb_array_elements(stages) WITH ORDINALITY AS t(s, i))
     WHERE preset AND key IN ('full-repolish', 're-body', 'new-work')`,
    { replacements: { from, to } },
  );
}
