/**
 * Assembling the documents: the quote PDF's content, the booked schedule, an estimate's own document and the acceptance record.
 */
import { today } from '@shared/time';
import fs from 'node:fs/promises';
import { Op, type Transaction } from 'sequelize';
import { CUSTOMER_VENTILATION_TEXT, customerCautions } from '@shared/calc';
import { formatArea } from '@shared/units';
import { QUOTE_TERMS, customerPriceLines, roundHoursForCustomer, type AgreedFigures, type QuoteExtra, type QuoteLineDto, type QuotePricing } from '@shared/schemas/quotes';
import { HttpProblem, problems } from '../../http/problem';
import { Customer, Estimate, EstimateRevision, Job, Piece, PiecePhoto, type QuoteLine, User } from '../../models';
import { currentWorkshop } from '../workshops';
import type { AcceptanceRecord } from '../../pdf/acceptance-pdf';
import type { QuoteDocument, QuoteDocumentLine } from '../../pdf/quote-document';
import { loadSettings } from '../catalog';
import { workingCopyPath } from '../photos';
import { linesOf } from './locks';
import { agreedOf, quotePricing, shownPricing } from './pricing';
import { iso, lineDtos, load } from './read';
import { allOf } from '../../db/queries';

// ------------------------------------------------------------------------------------------------ PDF

function restText(hours: number): string {
  if (hours <= 0) return '—';
  if (hours < 48) return `${Math.round(hours)} h`;
  return `${Math.round(hours / 24)} days`;
}

/** Gathers a quote's PDF content. With no quote (an estimate's draft), it shows the estimate at today's terms. */
export async function buildDocument(quoteId: number, uploadsDir: string, transaction?: Transaction): Promise<QuoteDocument> {
  const { quote, estimate, customer } = await load(quoteId, transaction);
  const revision = await EstimateRevision.findByPk(quote.revisionId, { transaction });
  if (!revision) throw new HttpProblem(500, 'quote_without_revision', 'Quote has no revision');
  const lines = await linesOf(quote.id, transaction);
  // Several lines: the price shown is the recommended choice's until accepted, then the customer's choice.
  const { pricing, lines: priced } = shownPricing(quote, lines);
  const revisions = lines.length > 1 ? await EstimateRevision.findAll({ where: { id: lines.map((l) => l.revisionId) }, transaction }) : [];
  const priceHours = lines.length > 1 ? priced.reduce((t, l) => t + (revisions.find((r) => r.id === l.revisionId)?.result.totals.labourHours ?? 0), 0) : undefined;
  return documentFor({
    uploadsDir,
    estimate,
    customer,
    revision,
    lines: lines.length > 1 ? lines : undefined,
    revisions,
    priceHours,
    pricing,
    number: quote.number,
    validUntil: quote.validUntil,
    message: quote.message,
    extras: quote.extras,
    createdBy: quote.createdBy,
    agreed: agreedOf(quote),
    schedule: await bookedSchedule(quote.id, transaction),
    transaction,
  });
}

/** The booked dates of the quote's live job: the first day in the room and the day it leaves. Null until booked. */
export async function bookedSchedule(quoteId: number, transaction?: Transaction): Promise<{ start: string; ready: string } | null> {
  const job = await Job.findOne({ where: { quoteId, state: { [Op.in]: ['booked', 'in-progress', 'finished'] } }, transaction });
  if (!job || !job.roomStart || !job.roomEnd) return null;
  return { start: job.roomStart.slice(0, 10), ready: job.roomEnd.slice(0, 10) };
}

export async function estimateDocument(estimateId: number, uploadsDir: string): Promise<QuoteDocument> {
  const estimate = await Estimate.findByPk(estimateId);
  if (!estimate) throw problems.notFound('Estimate');
  const customer = await Customer.findByPk(estimate.customerId);
  const revision = await EstimateRevision.findByPk(estimate.currentRevisionId!);
  if (!customer || !revision) throw problems.notFound('Estimate');
  const { settings } = await loadSettings();
  const depositPct = settings.pricing.depositPct;
  const pricing = quotePricing(revision, revision.input.discountPct ?? 0, depositPct);
  return documentFor({ uploadsDir, estimate, customer, revision, pricing, number: `Draft of ${estimate.number}`, validUntil: estimate.validUntil, message: '', extras: [], createdBy: estimate.ownerId, agreed: null, schedule: null });
}

async function documentFor(a: {
  uploadsDir: string;
  estimate: Estimate;
  customer: Customer;
  revision: EstimateRevision;
  lines?: QuoteLine[];
  revisions?: EstimateRevision[];
  priceHours?: number;
  pricing: QuotePricing;
  number: string;
  validUntil: string;
  message: string;
  extras: QuoteExtra[];
  createdBy: number | null;
  agreed: AgreedFigures | null;
  schedule: { start: string; ready: string } | null;
  transaction?: Transaction;
}): Promise<QuoteDocument> {
  const { transaction, revision, pricing } = a;
  const workshop = await currentWorkshop(transaction);
  const { settings } = await loadSettings(transaction);
  const author = a.createdBy ? await User.findByPk(a.createdBy, { transaction }) : null;
  const r = revision.result;
  const main = await pieceAndWork(a.estimate.pieceId, a.estimate.title, revision, settings.units, a.schedule, a.uploadsDir, transaction);
  const lineDocs: QuoteDocumentLine[] | undefined = a.lines
    ? await allOf(
        transaction,
        a.lines.map((l) => async () => {
          const rev = a.revisions?.find((x) => x.id === l.revisionId) ?? revision;
          const est = await Estimate.findByPk(l.estimateId, { attributes: ['id', 'title'], transaction });
          const doc = await pieceAndWork(l.pieceId, est?.title ?? '', rev, settings.units, a.schedule, a.uploadsDir, transaction);
          return {
            group: l.optionGroup,
            groupOptional: l.groupOptional,
            options: a.lines!.filter((x) => x.optionGroup === l.optionGroup).length,
            label: l.label,
            recommended: l.recommended,
            chosen: l.chosen,
            piece: doc.piece,
            work: doc.work,
            total: Number(l.total).toFixed(2),
          };
        }),
      )
    : undefined;
  const cautionCodes = new Map<string, EstimateRevision['result']['cautions'][number]>();
  for (const rev of [revision, ...(a.revisions ?? [])]) for (const c of rev.result.cautions) cautionCodes.set(c.code, c);
  return {
    paperSize: settings.paperSize,
    workshop: { name: workshop?.name ?? 'Workshop', address: workshop?.address ?? null, email: workshop?.email ?? null, phone: workshop?.phone ?? null },
    quote: {
      number: a.number,
      estimateNumber: `${a.estimate.number} rev. ${revision.number}`,
      issuedOn: today(),
      validUntil: a.validUntil,
      message: a.message,
      currency: pricing.currency,
      pricesIncludeTax: settings.pricesIncludeTax,
      taxLabel: pricing.taxLabel,
      preparedBy: author?.name ?? '',
    },
    customer: { name: a.customer.name, address: a.customer.address, email: a.customer.email, phone: a.customer.phone },
    piece: lineDocs ? { ...main.piece, description: [...new Set(lineDocs.map((l) => l.piece.description))].join('; '), kind: '', maker: null, year: null, serial: null, photo: null, photoCaption: null } : main.piece,
    work: main.work,
    lines: lineDocs,
    price: {
      lines: customerPriceLines(pricing, a.priceHours ?? r.totals.labourHours).map((l) => ({ label: l.label, amount: l.amount })),
      total: pricing.total,
      depositPct: pricing.depositPct,
      deposit: a.agreed?.deposit ?? pricing.deposit,
      balance: a.agreed?.balance ?? pricing.balance,
      agreed: a.agreed ? { extras: a.agreed.extras.map((x) => ({ label: x.label, price: x.priceWithTax })), total: a.agreed.total } : null,
    },
    extras: a.extras.map((x) => ({ label: x.label, description: x.description, hours: x.hours, price: x.priceWithTax })),
    terms: QUOTE_TERMS,
    // The customer reads plain cautions: the workshop's air-change arithmetic stays on staff screens.
    cautions: customerCautions([...cautionCodes.values()]),
    ventilationText: CUSTOMER_VENTILATION_TEXT,
  };
}

/** A piece as the customer's documents show it (with its first photo) and the work of a revision in plain words. */
async function pieceAndWork(
  pieceId: number,
  title: string,
  revision: EstimateRevision,
  units: Parameters<typeof formatArea>[1],
  schedule: { start: string; ready: string } | null,
  uploadsDir: string,
  transaction?: Transaction,
): Promise<Pick<QuoteDocument, 'piece' | 'work'>> {
  const piece = await Piece.findByPk(pieceId, { transaction });
  const photo = await PiecePhoto.findOne({ where: { pieceId, mime: { [Op.in]: ['image/jpeg', 'image/png'] } }, order: [['id', 'ASC']], transaction });
  let photoBytes: Buffer | null = null;
  // The bounded working copy, never the original: a camera's full-size file would make every PDF slow.
  const workPath = photo ? await workingCopyPath(uploadsDir, photo) : null;
  if (workPath) photoBytes = await fs.readFile(workPath).catch(() => null);
  const r = revision.result;
  const system = revision.catalog.systems.find((s) => s.key === r.system);
  return {
    piece: {
      description: piece?.description ?? title,
      kind: piece?.kind ?? '',
      maker: piece?.maker ?? null,
      year: piece ? (piece.yearText ?? (piece.year === null ? null : String(piece.year))) : null,
      serial: piece?.serial ?? null,
      photo: photoBytes,
      photoCaption: photo?.caption || null,
    },
    work: {
      systemName: system?.name ?? r.system,
      areaM2: r.totals.areaM2,
      areaText: formatArea(r.totals.areaM2, units),
      totalCoats: r.totals.coats,
      labourHours: roundHoursForCustomer(r.totals.labourHours),
      calendarDays: r.totals.calendarDays,
      // Dates are promised only once the job is booked; the estimate's own calendar is a planning guess.
      startDate: schedule?.start ?? null,
      readyDate: schedule?.ready ?? null,
      datesBooked: schedule !== null,
      stages: r.stages
        .filter((s) => s.sessions > 0)
        .map((s) => ({ name: s.name, sessions: s.sessions, coats: s.coats > 0 ? s.coats : null, hours: roundHoursForCustomer(s.labourHours), restText: restText(s.restHours) })),
    },
  };
}

/** The acceptance record of an accepted quote: what was agreed, by whom, when, from which address. */
export async function acceptanceRecordOf(quoteId: number): Promise<AcceptanceRecord> {
  const { quote, estimate, customer } = await load(quoteId);
  const agreed = agreedOf(quote);
  if (!agreed || !quote.acceptedAt) throw problems.conflict('not_accepted', `Quote ${quote.number} has not been accepted: there is no acceptance record yet.`);
  const [revision, workshop, { settings }, piece] = await Promise.all([
    EstimateRevision.findByPk(quote.revisionId),
    currentWorkshop(),
    loadSettings(),
    Piece.findByPk(estimate.pieceId),
  ]);
  const r = revision!.result;
  const lines = await lineDtos(await linesOf(quote.id));
  const several = lines.length > 1;
  const optionName = (l: QuoteLineDto) => l.label || l.estimate.title;
  const chosen = lines.filter((l) => l.chosen);
  return {
    ...(several
      ? {
          choices: chosen.map((l) => ({ piece: l.piece.description, option: optionName(l), hours: roundHoursForCustomer(l.labourHours), total: l.total })),
          optionsDeclined: lines.filter((l) => !l.chosen).map((l) => `${l.piece.description}: ${optionName(l)}`),
        }
      : {}),
    paperSize: settings.paperSize,
    workshop: { name: workshop?.name ?? 'Workshop', address: workshop?.address ?? null, email: workshop?.email ?? null, phone: workshop?.phone ?? null },
    quoteNumber: quote.number,
    estimateNumber: `${estimate.number} rev. ${revision!.number}`,
    customerName: customer.name,
    piece: several ? [...new Set(chosen.map((l) => l.piece.description))].join('; ') : (piece?.description ?? estimate.title),
    systemName: several ? `${chosen.length} ${chosen.length === 1 ? 'piece' : 'pieces'}` : (revision!.catalog.systems.find((s) => s.key === r.system)?.name ?? r.system),
    currency: quote.currency,
    taxLabel: quote.pricing.taxLabel,
    quotedTotal: several ? (chosen.reduce((t, l) => t + Math.round(Number(l.total) * 100), 0) / 100).toFixed(2) : Number(quote.total).toFixed(2),
    extrasTaken: agreed.extras.map((x) => ({ label: x.label, hours: x.hours, price: x.priceWithTax })),
    extrasDeclined: quote.extras.filter((x) => !agreed.extras.some((y) => y.id === x.id)).map((x) => x.label),
    agreedTotal: agreed.total,
    depositPct: Number(quote.depositPct),
    deposit: agreed.deposit,
    balance: agreed.balance,
    acceptedName: quote.acceptedName ?? '',
    acceptedAt: quote.acceptedAt.toISOString(),
    acceptedIp: quote.acceptedIp ?? '',
    depositPaidAt: iso(quote.depositPaidAt),
    terms: QUOTE_TERMS,
  };
}
