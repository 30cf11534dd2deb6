import multer from 'multer';
import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import {
  ApplyPriceFileSchema,
  CreateMaterialSchema,
  CreatePackSchema,
  MaterialListQuerySchema,
  NewPriceSchema,
  UpdateMaterialSchema,
  UpdatePackSchema,
} from '@shared/schemas/price-list';
import { secureRouter, type RouteInfo } from '../http/guard';
import { multipart } from '../http/input';
import { parseOr400, problems } from '../http/problem';
import { applyPriceFile, getPriceFilePreview, PRICE_FILE_MAX_BYTES, previewPriceFile, uploadProblem } from '../services/price-file';
import { addPack, createMaterial, getMaterial, listMaterials, materialHistory, setPackPrice, updateMaterial, updatePack } from '../services/price-list';

const IdParam = z.object({ id: z.coerce.number({ message: 'must be a number' }).int().positive().max(2_147_483_647) });
const PreviewParam = z.object({ id: z.uuid({ message: 'must be a preview id' }) });

/** Everyone who prices, sells or plans reads the price list; only the owner changes it. */

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: PRICE_FILE_MAX_BYTES, files: 1, fields: 5, parts: 6 } }).single('file');
const receiveFile = multipart(upload, 'file', uploadProblem);

export function priceListRoutes(sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/price-list', table);
  r.get('/materials', 'readPriceList', async (req, res) => {
    res.json(await listMaterials(sequelize, parseOr400(MaterialListQuerySchema, req.query)));
  });
  r.post('/materials', 'editPrices', async (req, res) => {
    res.status(201).json(await createMaterial(sequelize, req.user!.id, parseOr400(CreateMaterialSchema, req.body)));
  });
  r.get('/materials/:id', 'readPriceList', async (req, res) => {
    res.json(await getMaterial(parseOr400(IdParam, req.params).id));
  });
  r.patch('/materials/:id', 'editPrices', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updateMaterial(sequelize, req.user!.id, id, parseOr400(UpdateMaterialSchema, req.body)));
  });
  r.get('/materials/:id/history', 'readPriceList', async (req, res) => {
    res.json(await materialHistory(sequelize, parseOr400(IdParam, req.params).id));
  });
  r.post('/materials/:id/packs', 'editPrices', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await addPack(sequelize, req.user!.id, id, parseOr400(CreatePackSchema, req.body)));
  });
  r.patch('/packs/:id', 'editPrices', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.json(await updatePack(sequelize, req.user!.id, id, parseOr400(UpdatePackSchema, req.body)));
  });
  /** A new price from a date; the old one stays in the history. */
  r.post('/packs/:id/prices', 'editPrices', async (req, res) => {
    const { id } = parseOr400(IdParam, req.params);
    res.status(201).json(await setPackPrice(sequelize, req.user!.id, id, parseOr400(NewPriceSchema, req.body)));
  });

  /** A supplier's price file: multipart field "file"; answers the stored preview. */
  r.post('/price-files', 'editPrices', ...receiveFile, async (req, res) => {
    if (!req.file) throw problems.badRequest('price_file_missing', 'Choose a CSV file to upload (form field "file").', 'file');
    res.status(201).json(await previewPriceFile(req.user!.id, req.file.originalname, req.file.buffer));
  });
  r.get('/price-files/:id', 'editPrices', async (req, res) => {
    res.json(await getPriceFilePreview(parseOr400(PreviewParam, req.params).id));
  });
  /** Applies the previewed file, named by its id and the hash of the content that was shown. */
  r.post('/price-files/:id/apply', 'editPrices', async (req, res) => {
    const { id } = parseOr400(PreviewParam, req.params);
    const { contentHash } = parseOr400(ApplyPriceFileSchema, req.body);
    res.json(await applyPriceFile(sequelize, req.user!.id, id, contentHash));
  });
  return r.router;
}
