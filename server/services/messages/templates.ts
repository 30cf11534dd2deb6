/**
 * The owner's message templates and reminder settings, and the one way a message is made: the template filled in,
 * laid out in the house order (greeting, the template's text, the safety note, sign-off) and put in the outbox for
 * the customer, with a job on the queue to send it once the transaction has committed.
 */
import { TZDate } from '@date-fns/tz';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  MESSAGE_KIND_LABELS,
  MESSAGE_KIND_WHEN,
  MESSAGE_KINDS,
  PLACEHOLDERS,
  renderTemplate,
  SAMPLE_VALUES,
  type MessageKind,
  type MessagePreview,
  type MessageSettings,
  type MessageTemplateDto,
  type MessageTemplateUpdate,
  type PlaceholderValues,
} from '@shared/schemas/messages';
import { workshopTimeZone } from '@shared/time';
import { Customer, OutboxMessage } from '../../models';
import { audit } from '../audit';
import { loadSettings } from '../catalog';
import { composeMail } from '../mail-compose';
import { DEFAULT_TEMPLATES } from './defaults';
import { runningQueue } from './queue';
import { currentWorkshopId as scopedWorkshopId } from '../../db/workshop-context';

/**
 * Every message about the customer's estimate carries the cautions of the trade (the product's rule for estimate
 * outputs), after the template's text, where the owner's edits cannot take them out.
 */
export const MESSAGE_SAFETY_NOTE =
  'A note on safety: French polishing uses flammable spirit and shellac, rags soaked in oil or polish can catch fire by themselves, and methylated spirit (methanol) is toxic. We work under our ventilation and fire precautions, following local fire codes, the workplace-safety regulator and licensed practice; please do not try to strip or refinish the piece yourself with these materials without the same care.';

/** What {link} reads when the customer's own link is not at hand (it is kept only as a hash). */
export const LINK_FALLBACK = 'the link in the e-mail that brought your quote';

/** The workshop the current work runs under: the request's or the job's, else the one row-level security shows. */
export async function currentWorkshopId(transaction?: Transaction): Promise<number> {
  return scopedWorkshopId() ?? (await loadSettings(transaction)).workshop.id;
}

interface TemplateRow {
  kind: string;
  subject: string;
  body: string;
  edited: boolean;
  updated_at: Date | null;
}

async function rows(sequelize: Sequelize, workshopId: number, transaction?: Transaction): Promise<Map<string, TemplateRow>> {
  const found = await sequelize.query<TemplateRow>('SELECT kind, subject, body, edited, updated_at FROM message_templates WHERE workshop_id = :workshopId', {
    type: QueryTypes.SELECT,
    replacements: { workshopId },
    transaction,
  });
  return new Map(found.map((r) => [r.kind, r]));
}

function dto(kind: MessageKind, row: TemplateRow | undefined): MessageTemplateDto {
  const t = row ?? { ...DEFAULT_TEMPLATES[kind], edited: false, updated_at: null };
  return { kind, label: MESSAGE_KIND_LABELS[kind], when: MESSAGE_KIND_WHEN[kind], subject: t.subject, body: t.body, edited: t.edited, updatedAt: t.updated_at ? new Date(t.updated_at).toISOString() : null };
}

export async function listTemplates(sequelize: Sequelize, workshopId: number): Promise<MessageTemplateDto[]> {
  const found = await rows(sequelize, workshopId);
  return MESSAGE_KINDS.map((k) => dto(k, found.get(k)));
}

export async function templateOf(sequelize: Sequelize, workshopId: number, kind: MessageKind, transaction?: Transaction): Promise<MessageTemplateDto> {
  return dto(kind, (await rows(sequelize, workshopId, transaction)).get(kind));
}

export async function updateTemplate(sequelize: Sequelize, actorId: number, workshopId: number, kind: MessageKind, input: MessageTemplateUpdate): Promise<MessageTemplateDto> {
  return sequelize.transaction(async (transaction) => {
    const before = await templateOf(sequelize, workshopId, kind, transaction);
    const defaults = DEFAULT_TEMPLATES[kind];
    const edited = input.subject !== defaults.subject || input.body !== defaults.body;
    await sequelize.query(
      `INSERT INTO message_templates (workshop_id, kind, subject, body, edited, updated_by, updated_at)
       VALUES (:workshopId, :kind, :subject, :body, :edited, :actorId, now())
       ON CONFLICT (workshop_id, kind) DO UPDATE SET subject = EXCLUDED.subject, body = EXCLUDED.body, edited = EXCLUDED.edited,
         updated_by = EXCLUDED.updated_by, updated_at = EXCLUDED.updated_at`,
      { replacements: { workshopId, kind, subject: input.subject, body: input.body, edited, actorId }, transaction },
    );
    await audit(
      { userId: actorId, action: 'message.template', entityType: 'message_template', entityId: MESSAGE_KINDS.indexOf(kind) + 1, before: { kind, subject: before.subject, body: before.body }, after: { kind, ...input } },
      transaction,
    );
    return templateOf(sequelize, workshopId, kind, transaction);
  });
}

/** The template (as saved, or as typed and not yet saved) filled in with invented values, laid out as it is sent. */
export async function previewTemplate(sequelize: Sequelize, workshopId: number, kind: MessageKind, typed?: MessageTemplateUpdate): Promise<MessagePreview> {
  const t = typed ?? (await templateOf(sequelize, workshopId, kind));
  const { workshop } = await loadSettings();
  const values = { ...SAMPLE_VALUES, workshop: workshop.name };
  const { text } = compose({ name: values.customer, body: renderTemplate(t.body, values), workshop });
  return { subject: renderTemplate(t.subject, values), text };
}

function compose(p: { name: string; body: string; workshop: { name: string; phone?: string | null; email?: string | null } }) {
  return composeMail({
    name: p.name,
    message: p.body,
    paragraphs: [{ text: MESSAGE_SAFETY_NOTE, small: true }],
    signOff: { from: null, workshop: p.workshop.name, phone: p.workshop.phone ?? null, email: p.workshop.email ?? null },
  });
}

// ---------------------------------------------------------------------------------------------- settings

const DEFAULT_SETTINGS: MessageSettings = { unansweredAfterDays: 7, expiringBeforeDays: 3 };

export async function getMessageSettings(sequelize: Sequelize, workshopId: number, transaction?: Transaction): Promise<MessageSettings> {
  const [row] = await sequelize.query<{ unanswered_after_days: number; expiring_before_days: number }>(
    'SELECT unanswered_after_days, expiring_before_days FROM message_settings WHERE workshop_id = :workshopId',
    { type: QueryTypes.SELECT, replacements: { workshopId }, transaction },
  );
  return row ? { unansweredAfterDays: row.unanswered_after_days, expiringBeforeDays: row.expiring_before_days } : DEFAULT_SETTINGS;
}

export async function updateMessageSettings(sequelize: Sequelize, actorId: number, workshopId: number, input: MessageSettings): Promise<MessageSettings> {
  return sequelize.transaction(async (transaction) => {
    const before = await getMessageSettings(sequelize, workshopId, transaction);
    await sequelize.query(
      `INSERT INTO message_settings (workshop_id, unanswered_after_days, expiring_before_days, updated_at) VALUES (:workshopId, :a, :b, now())
       ON CONFLICT (workshop_id) DO UPDATE SET unanswered_after_days = EXCLUDED.unanswered_after_days, expiring_before_days = EXCLUDED.expiring_before_days, updated_at = now()`,
      { replacements: { workshopId, a: input.unansweredAfterDays, b: input.expiringBeforeDays }, transaction },
    );
    await audit({ userId: actorId, action: 'message.settings', entityType: 'workshop', entityId: workshopId, before: { ...before }, after: { ...input } }, transaction);
    return getMessageSettings(sequelize, workshopId, transaction);
  });
}

// ---------------------------------------------------------------------------------------------- making a message

/** A template filled in for a real customer: the subject and the text the covering message of an e-mail takes. */
export async function fillTemplate(
  sequelize: Sequelize,
  workshopId: number,
  kind: MessageKind,
  values: Partial<PlaceholderValues>,
  transaction?: Transaction,
): Promise<{ subject: string; body: string }> {
  const t = await templateOf(sequelize, workshopId, kind, transaction);
  const { workshop } = await loadSettings(transaction);
  const full = Object.fromEntries(PLACEHOLDERS.map((p) => [p, values[p] ?? ''])) as PlaceholderValues;
  full.workshop = values.workshop ?? workshop.name;
  if (!values.link) full.link = LINK_FALLBACK;
  return { subject: renderTemplate(t.subject, full).trim(), body: renderTemplate(t.body, full) };
}

export interface MessageSpec {
  workshopId: number;
  kind: MessageKind;
  customerId: number;
  quoteId: number | null;
  jobId?: number | null;
  values: Partial<PlaceholderValues>;
  /** One message per event: the same key again makes nothing new. */
  dedupeKey: string;
  sendAfter?: Date | null;
  actorId: number | null;
  /** The address the quote went to, when it differs from the customer's own. */
  to?: string | null;
}

/**
 * Puts a customer message in the outbox inside the caller's transaction; once it commits, a job on the queue sends
 * it (at `sendAfter` when given). Returns the outbox id, or null when the customer has no e-mail address or the
 * event already made its message.
 */
export async function queueCustomerMessage(sequelize: Sequelize, spec: MessageSpec, transaction: Transaction): Promise<number | null> {
  const customer = await Customer.findByPk(spec.customerId, { transaction });
  const to = (spec.to || customer?.email)?.trim();
  if (!customer || !to) return null;
  const { workshop } = await loadSettings(transaction);
  const filled = await fillTemplate(sequelize, spec.workshopId, spec.kind, { customer: customer.name, ...spec.values }, transaction);
  const { text, html } = compose({ name: customer.name, body: filled.body, workshop });
  const [row] = await sequelize.query<{ id: number }>(
    `INSERT INTO outbox (quote_id, customer_id, job_id, kind, dedupe_key, send_after, to_address, subject, text_body, html_body, status, attempts, created_by, created_at)
     VALUES (:quoteId, :customerId, :jobId, :kind, :dedupeKey, :sendAfter, :to, :subject, :text, :html, 'queued', 0, :actorId, now())
     ON CONFLICT (dedupe_key) WHERE dedupe_key IS NOT NULL DO NOTHING
     RETURNING id`,
    {
      type: QueryTypes.SELECT,
      transaction,
      replacements: {
        quoteId: spec.quoteId,
        customerId: customer.id,
        jobId: spec.jobId ?? null,
        kind: spec.kind,
        dedupeKey: spec.dedupeKey,
        sendAfter: spec.sendAfter ?? null,
        to,
        subject: filled.subject.slice(0, 300),
        text,
        html,
        actorId: spec.actorId,
      },
    },
  );
  if (!row) return null;
  const job = { workshopId: spec.workshopId, outboxId: row.id };
  transaction.afterCommit(() => {
    void runningQueue()?.send(job, spec.sendAfter).catch(() => undefined);
  });
  return row.id;
}

/** Marks an outbox row made elsewhere (a receipt or invoice e-mail) as this customer's message of a kind. */
export async function tagOutboxMessage(id: number, tag: { customerId: number; kind: MessageKind | null; jobId?: number | null }, transaction: Transaction): Promise<void> {
  await OutboxMessage.update({ customerId: tag.customerId, kind: tag.kind, jobId: tag.jobId ?? null }, { where: { id }, transaction });
}

/** 09:00 on a day in the workshop's time zone: when a reminder due that day goes. */
export function morningOf(day: string): Date {
  const [y, m, d] = day.split('-').map(Number) as [number, number, number];
  return new Date(new TZDate(y, m - 1, d, 9, 0, 0, workshopTimeZone()).getTime());
}
