import type { Sequelize } from 'sequelize';
import { z } from 'zod';
import { IdSchema } from '@shared/schemas/customers';
import { CustomerMessagesQuerySchema, MessageKindSchema, MessageSettingsSchema, MessageTemplateUpdateSchema } from '@shared/schemas/messages';
import type { Config } from '../config';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import {
  currentWorkshopId,
  getMessageSettings,
  listCustomerMessages,
  listTemplates,
  previewTemplate,
  sendReadyMessage,
  templateOf,
  updateMessageSettings,
  updateTemplate,
} from '../services/messages';

const IdParam = z.object({ id: IdSchema });
const KindParam = z.object({ kind: MessageKindSchema });

/** Message templates and reminder settings (the owner), a customer's messages, and "tell the customer it is ready". */
export function messageRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/messages', table);
  r.get('/templates', 'readMessages', async (_req, res) => res.json(await listTemplates(sequelize, await currentWorkshopId())));
  r.get('/templates/:kind', 'readMessages', async (req, res) => res.json(await templateOf(sequelize, await currentWorkshopId(), parseOr400(KindParam, req.params).kind)));
  r.put('/templates/:kind', 'editMessageTemplates', async (req, res) => {
    const { kind } = parseOr400(KindParam, req.params);
    res.json(await updateTemplate(sequelize, req.user!.id, await currentWorkshopId(), kind, parseOr400(MessageTemplateUpdateSchema, req.body)));
  });
  /** The saved template, or the text typed in the form (checked like a save), filled in with invented values. */
  r.post('/templates/:kind/preview', 'readMessages', async (req, res) => {
    const { kind } = parseOr400(KindParam, req.params);
    const typed = req.body && Object.keys(req.body as object).length ? parseOr400(MessageTemplateUpdateSchema, req.body) : undefined;
    res.json(await previewTemplate(sequelize, await currentWorkshopId(), kind, typed));
  });
  r.get('/settings', 'readMessages', async (_req, res) => res.json(await getMessageSettings(sequelize, await currentWorkshopId())));
  r.put('/settings', 'editMessageTemplates', async (req, res) => {
    res.json(await updateMessageSettings(sequelize, req.user!.id, await currentWorkshopId(), parseOr400(MessageSettingsSchema, req.body)));
  });
  r.get('/customers/:id', 'readMessages', async (req, res) => {
    res.json(await listCustomerMessages(parseOr400(IdParam, req.params).id, parseOr400(CustomerMessagesQuerySchema, req.query)));
  });
  r.post('/jobs/:id/ready', 'tellCustomerReady', async (req, res) => {
    res.status(201).json(await sendReadyMessage(sequelize, config, req.user!.id, parseOr400(IdParam, req.params).id));
  });
  return r.router;
}
