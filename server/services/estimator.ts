/**
 * Runs the shared estimator engine on the server, with the price list and settings from the database. The server
 * always computes for itself: totals sent by a client are never read.
 */
import type { Sequelize, Transaction } from 'sequelize';
import { validationSentence } from '@shared/schemas/error-map';
import { estimateParsed, EstimateError } from '@shared/calc';
import { EstimateInputSchema, type EstimateResult, type ParsedEstimateInput } from '@shared/schemas/calc';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { HttpProblem, parseOr400 } from '../http/problem';
import { loadCatalog, type LoadedCatalog } from './catalog';
import type { SharedCaches } from './shared-caches';

export interface ServerEstimate {
  input: ParsedEstimateInput;
  result: EstimateResult;
  loaded: LoadedCatalog;
}

/** Fills what the request left out from the workshop's settings, then validates (400 naming the field). */
export function withWorkshopDefaults(body: unknown, settings: WorkshopSettings): ParsedEstimateInput {
  const isObject = body !== null && typeof body === 'object' && !Array.isArray(body);
  const filled = isObject
    ? {
        units: settings.units,
        imperialVolumes: settings.imperialVolumes,
        defaultLengthUnit: settings.defaultLengthUnit,
        climate: { temperatureC: settings.dryingRoom.temperatureC, humidityPct: settings.dryingRoom.humidityPct },
        ...(body as Record<string, unknown>),
      }
    : body;
  return parseOr400(EstimateInputSchema, filled);
}

/**
 * Runs the engine on an input `withWorkshopDefaults` checked (it is not checked again); an input problem only the
 * catalog reveals (unknown system or species) is a 400 too.
 */
export function runEngine(input: ParsedEstimateInput, loaded: LoadedCatalog, today?: string): EstimateResult {
  try {
    return estimateParsed(input, loaded.catalog, today ? { today } : {});
  } catch (err) {
    if (err instanceof EstimateError) {
      const field = err.path.map(String).join('.') || '(body)';
      throw new HttpProblem(400, 'estimate_invalid', 'Cannot estimate', validationSentence(err.path, err.message), { field, errors: [{ field, message: err.message }] });
    }
    throw err;
  }
}

/** Validates a request body and estimates it against the current price list. */
export async function estimateFromBody(sequelize: Sequelize, body: unknown, opts: { transaction?: Transaction; onDate?: string; cache?: SharedCaches } = {}): Promise<ServerEstimate> {
  const loaded = await loadCatalog(sequelize, opts);
  const input = withWorkshopDefaults(body, loaded.settings);
  return { input, result: runEngine(input, loaded), loaded };
}
