/**
 * A job's account after the agreement: receipts for every payment counted (the deposit first), the tax invoice,
 * credit notes, the payments ledger and the balance.
 *
 * Every change to an account runs in one transaction under the quote's row lock (FOR UPDATE), so the balance read
 * there is the balance written against. Document numbers come from `document_counters`: the workshop's row for the
 * kind is locked FOR UPDATE and moved on by one inside the same transaction that stores the document, so numbers
 * are gap-free and never given twice. Issued documents are never edited (the database refuses it too): corrections
 * are credit notes. Each document goes to the customer as a PDF through the outbox, delivered after the commit.
 *
 * Inside these transactions every query uses the transaction (a query outside it would take a second connection
 * from the pool while waiting on the counter lock).
 */
import Decimal from 'decimal.js';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type Stripe from 'stripe';
import type { z } from 'zod';
import { money, sumMoney, toCents } from '@shared/money';
import {
  DOCUMENT_KIND_LABELS,
  DOCUMENT_PREFIX,
  PAYMENT_METHOD_LABELS,
  ageingBucket,
  type AccountDocumentDto,
  type AccountDto,
  type AccountFigures,
  type AccountSettingsSchema,
  type CreditNoteSchema,
  type DocumentKind,
  type InvoiceStage,
  type IssueInvoiceSchema,
  type LedgerEntryDto,
  type OwedPage,
  type OwedQuerySchema,
  type PaymentMethod,
  type PublicAccount,
  type RecordPaymentSchema,
} from '@shared/schemas/accounts';
import { localToday } from '@shared/schemas/dates';
import { DEFAULT_TIME_ZONE, dayOf, today } from '@shared/time';
import { mirrorEstimate, moveQuote } from '@shared/schemas/state-moves';
import type { Config } from '../config';
import { HttpProblem, problems } from '../http/problem';
import { AccountDocument, AccountEntry, AccountSetting, Customer, Estimate, Job, JobVariation, OutboxMessage, Payment, Quote, QuoteLine, User, type Workshop } from '../models';
import { currentWorkshop } from './workshops';
import type { DocumentContent } from '../models/accounts';
import { renderAccountPdf } from '../pdf/account-pdf';
import { formatDate, formatMoney } from '../pdf/pdf-format';
import { audit } from './audit';
import { loadSettings } from './catalog';
import { deliver } from './mail';
import { currentWorkshopId, fillTemplate, piecesOf, queueCustomerMessage } from './messages';
import type { MessageKind } from '@shared/schemas/messages';
import { composeMail } from './mail-compose';
import { offset, pageTotal } from './paging';
import { accountOfPayment, cardPaymentsReady, CHECKOUT_MINUTES, fromMinor, lapseCheckouts, minorUnits, onAccount, paymentClient, workshopPaymentAccount } from './payment-provider';
import { acceptanceRecordOf, hashToken, quoteLink, tokenSigned } from './quotes';

type RecordInput = z.output<typeof RecordPaymentSchema>;
type CreditInput = z.output<typeof CreditNoteSchema>;
type InvoiceInput = z.output<typeof IssueInvoiceSchema>;
type OwedQuery = z.output<typeof OwedQuerySchema>;

const fixed = (v: string | number | Decimal) => toCents(money(typeof v === 'number' ? String(v) : v)).toFixed(2);

// ------------------------------------------------------------------------------------------------ figures

/**
 * The tax inside an amount that includes it, at the workshop's rate: tax = amount × rate / (100 + rate), to the
 * cent (half away from zero); net = amount − tax, so net + tax is the amount exactly.
 *
 * @example taxSplit('1200.00', 20) // { net: '1000.00', tax: '200.00' }
 */
export function taxSplit(gross: string, pct: number): { net: string; tax: string } {
  const g = money(gross);
  const tax = pct <= 0 ? new Decimal(0) : toCents(g.times(money(String(pct))).dividedBy(money(String(pct)).plus(100)));
  return { net: g.minus(tax).toFixed(2), tax: tax.toFixed(2) };
}

/** balance = agreed total − credited − paid + refunded. */
export function balanceOf(f: { agreedTotal: string; credited: string; paid: string; refunded: string }): string {
  return money(f.agreedTotal).minus(money(f.credited)).minus(money(f.paid)).plus(money(f.refunded)).toFixed(2);
}

/** The account's figures, read in the caller's transaction. */
export async function figuresOf(quote: Quote, transaction?: Transaction): Promise<AccountFigures> {
  const sequelize = Quote.sequelize!;
  const [row] = await sequelize.query<{ credited: string | null; paid: string | null; refunded: string | null; variations: string | null }>(
    `SELECT (SELECT sum(total) FROM account_documents WHERE quote_id = :id AND kind = 'credit-note') AS credited,
            (SELECT sum(price) FROM job_variations WHERE quote_id = :id AND state = 'approved') AS variations,
            (SELECT sum(amount) FROM account_entries WHERE quote_id = :id AND kind = 'payment') AS paid,
            (SELECT sum(amount) FROM account_entries WHERE quote_id = :id AND kind = 'refund') AS refunded`,
    { replacements: { id: quote.id }, type: QueryTypes.SELECT, transaction },
  );
  const f = {
    currency: quote.currency,
    // What was accepted, plus the variations the customer approved since (server/services/job-end/variations.ts).
    agreedTotal: money(quote.acceptedTotal ?? '0').plus(money(row?.variations ?? '0')).toFixed(2),
    credited: fixed(row?.credited ?? '0'),
    paid: fixed(row?.paid ?? '0'),
    refunded: fixed(row?.refunded ?? '0'),
  };
  return { ...f, balance: balanceOf(f) };
}

// ------------------------------------------------------------------------------------------------ numbers

/**
 * The next number of a kind of document for a workshop: the counter row is locked FOR UPDATE and moved on inside the
 * caller's transaction, so the number is taken only if the document is committed with it.
 */
export async function allocateNumber(workshopId: number, kind: DocumentKind, transaction: Transaction): Promise<{ seq: number; number: string }> {
  const sequelize = Quote.sequelize!;
  await sequelize.query('INSERT INTO document_counters (workshop_id, kind, last_number) VALUES (:workshopId, :kind, 0) ON CONFLICT DO NOTHING', {
    replacements: { workshopId, kind },
    transaction,
  });
  const [row] = await sequelize.query<{ last_number: number }>('SELECT last_number FROM document_counters WHERE workshop_id = :workshopId AND kind = :kind FOR UPDATE', {
    replacements: { workshopId, kind },
    type: QueryTypes.SELECT,
    transaction,
  });
  const seq = Number(row!.last_number) + 1;
  await sequelize.query('UPDATE document_counters SET last_number = :seq WHERE workshop_id = :workshopId AND kind = :kind', {
    replacements: { workshopId, kind, seq },
    transaction,
  });
  return { seq, number: `${DOCUMENT_PREFIX[kind]}-${String(seq).padStart(5, '0')}` };
}

// ------------------------------------------------------------------------------------------------ locking

/** The quote of an account, locked for a change; 409 unless it was accepted. */
async function lockAccount(quoteId: number, transaction: Transaction): Promise<Quote> {
  const quote = await Quote.findByPk(quoteId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!quote) throw problems.notFound('Quote');
  if (!['accepted', 'deposit-paid'].includes(quote.state) || quote.acceptedTotal === null) {
    throw problems.conflict('not_agreed', `Quote ${quote.number} is ${quote.state}: only an accepted quote has an account.`);
  }
  return quote;
}

interface Party {
  workshop: Workshop;
  paperSize: 'A4' | 'Letter';
  customer: Customer;
  to: string | null;
  jobNumbers: string[];
}

async function partyOf(quote: Quote, transaction: Transaction): Promise<Party> {
  const { workshop, settings } = await loadSettings(transaction);
  const estimate = await Estimate.findByPk(quote.estimateId, { attributes: ['id', 'customerId'], transaction });
  const customer = await Customer.findByPk(estimate!.customerId, { transaction });
  const jobs = await Job.findAll({ where: { quoteId: quote.id }, attributes: ['number', 'state'], order: [['id', 'ASC']], transaction });
  return {
    workshop,
    paperSize: settings.paperSize,
    customer: customer!,
    to: quote.recipient ?? customer!.email ?? null,
    jobNumbers: jobs.filter((j) => j.state !== 'cancelled').map((j) => j.number),
  };
}

function methodWords(method: PaymentMethod): string {
  return PAYMENT_METHOD_LABELS[method].toLowerCase();
}

function entryLabel(e: Pick<AccountEntry, 'kind' | 'method' | 'note' | 'reference'>): string {
  if (e.kind === 'refund') return `Refunded by ${methodWords(e.method)}`;
  const what = e.note === 'Deposit' ? 'Deposit paid' : 'Paid';
  return `${what} by ${methodWords(e.method)}${e.reference && e.method !== 'card' ? ` (${e.reference})` : ''}`;
}

const SAFETY_NOTE =
  'French polishing uses flammable spirit and shellac, and oily rags can self-ignite: the work was done under the workshop\u2019s ventilation and fire precautions, following local fire codes and the workplace-safety regulator.';

// ---------------------------------------------------------------------------------------------- documents

interface IssueSpec {
  kind: DocumentKind;
  quote: Quote;
  party: Party;
  actorId: number | null;
  total: string;
  taxPct: number;
  taxLabel: string;
  balanceDue: string;
  /** The agreed total with approved variations (figuresOf). */
  agreedTotal: string;
  lines: DocumentContent['lines'];
  payments: DocumentContent['payments'];
  credits: DocumentContent['credits'];
  receivedToDate: string;
  reason?: string | null;
  invoice?: AccountDocument | null;
  entryId?: number | null;
  refund?: DocumentContent['refund'];
  note?: string | null;
  /** The customer message this e-mail also is (deposit receipt, balance due): its kind and the owner's text for it. */
  covering?: { kind: MessageKind; body: string } | null;
}

/** Stores a document with the next number, renders it and queues it for the customer; returns it and the message id. */
async function issue(spec: IssueSpec, transaction: Transaction): Promise<{ doc: AccountDocument; outboxId: number | null }> {
  const { quote, party } = spec;
  const { seq, number } = await allocateNumber(party.workshop.id, spec.kind, transaction);
  const { net, tax } = taxSplit(spec.total, spec.taxPct);
  const issuedAt = new Date();
  const content: DocumentContent = {
    kind: spec.kind,
    number,
    issuedOn: localToday(issuedAt),
    paperSize: party.paperSize,
    workshop: { name: party.workshop.name, address: party.workshop.address, email: party.workshop.email, phone: party.workshop.phone },
    customer: { name: party.customer.name, address: party.customer.address, email: party.to },
    quoteNumber: quote.number,
    jobNumbers: party.jobNumbers,
    currency: quote.currency,
    lines: spec.lines,
    total: spec.total,
    net,
    tax,
    taxLabel: spec.taxLabel,
    taxPct: spec.taxPct,
    payments: spec.payments,
    credits: spec.credits,
    balanceDue: spec.balanceDue,
    agreedTotal: spec.agreedTotal,
    receivedToDate: spec.receivedToDate,
    reason: spec.reason ?? null,
    againstNumber: spec.invoice?.number ?? null,
    refund: spec.refund ?? null,
    note: spec.note || null,
  };
  const doc = await AccountDocument.create(
    {
      workshopId: party.workshop.id,
      kind: spec.kind,
      seq,
      number,
      quoteId: quote.id,
      customerId: party.customer.id,
      invoiceId: spec.invoice?.id ?? null,
      entryId: spec.entryId ?? null,
      currency: quote.currency,
      total: spec.total,
      net,
      tax,
      taxPct: spec.taxPct,
      taxLabel: spec.taxLabel,
      balanceDue: spec.balanceDue,
      reason: spec.reason ?? null,
      content,
      issuedAt,
      issuedBy: spec.actorId,
      outboxId: null,
    },
    { transaction },
  );
  await audit({ userId: spec.actorId, action: `account.${spec.kind}`, entityType: 'quote', entityId: quote.id, after: { number, total: spec.total, balanceDue: spec.balanceDue } }, transaction);
  if (!party.to) return { doc, outboxId: null };
  const pdf = await renderAccountPdf(content);
  const m = money;
  const fmt = (a: string) => formatMoney(a, quote.currency);
  const body =
    spec.kind === 'receipt'
      ? `Thank you for your payment of ${fmt(spec.lines[0]?.amount ?? spec.total)} for quote ${quote.number}. Your receipt ${number} is attached. ${m(spec.balanceDue).isZero() ? 'Nothing more is owed.' : `${fmt(spec.balanceDue)} remains to be paid.`}`
      : spec.kind === 'invoice'
        ? `Please find attached our tax invoice ${number} for the work agreed in quote ${quote.number}: ${fmt(spec.total)} in all. ${m(spec.balanceDue).isZero() ? 'It has been paid in full: thank you.' : `With what you have paid already, ${fmt(spec.balanceDue)} is now due.`}`
        : `Please find attached our credit note ${number}, which reduces invoice ${spec.invoice?.number ?? ''} by ${fmt(spec.total)}.${spec.refund ? ` We are refunding ${fmt(spec.refund.amount)} to you by ${spec.refund.method}.` : ''} ${m(spec.balanceDue).isZero() ? 'Nothing more is owed.' : `${fmt(spec.balanceDue)} remains to be paid.`}`;
  const { text, html } = composeMail({
    name: party.customer.name,
    message: spec.covering?.body ?? '',
    paragraphs: [{ text: body }, { text: SAFETY_NOTE, small: true }],
    signOff: { from: null, workshop: party.workshop.name, phone: party.workshop.phone ?? null, email: party.workshop.email ?? null },
  });
  const outbox = await OutboxMessage.create(
    {
      quoteId: null,
      customerId: party.customer.id,
      kind: spec.covering?.kind ?? null,
      toAddress: party.to,
      subject: `${DOCUMENT_KIND_LABELS[spec.kind]} ${number} from ${party.workshop.name}`,
      textBody: text,
      htmlBody: html,
      attachmentName: `${number}.pdf`,
      attachment: pdf,
      lastError: null,
      messageId: null,
      createdBy: spec.actorId,
      sentAt: null,
    },
    { transaction },
  );
  await doc.update({ outboxId: outbox.id }, { transaction });
  return { doc, outboxId: outbox.id };
}

/** The variations the customer approved on the agreement's jobs, in the order they were approved. */
async function approvedVariations(quoteId: number, transaction: Transaction): Promise<JobVariation[]> {
  return JobVariation.findAll({ where: { quoteId, state: 'approved' }, order: [['answeredAt', 'ASC'], ['id', 'ASC']], transaction });
}

/** The workshop's tax rate and label, from its settings now. */
async function taxOf(transaction: Transaction): Promise<{ pct: number; label: string }> {
  const { settings } = await loadSettings(transaction);
  return { pct: settings.pricing.taxPct, label: settings.pricing.taxLabel };
}

/** A receipt for a ledger payment just made, with the balance after it. */
async function receiptFor(quote: Quote, entry: AccountEntry, actorId: number | null, transaction: Transaction, covering?: IssueSpec['covering']): Promise<{ doc: AccountDocument; outboxId: number | null }> {
  const party = await partyOf(quote, transaction);
  const tax = await taxOf(transaction);
  const f = await figuresOf(quote, transaction);
  return issue(
    {
      kind: 'receipt',
      quote,
      party,
      actorId,
      total: fixed(entry.amount),
      taxPct: tax.pct,
      taxLabel: tax.label,
      balanceDue: f.balance,
      agreedTotal: f.agreedTotal,
      lines: [{ description: entryLabel(entry), note: `Received on ${formatDate(entry.receivedOn)}`, amount: fixed(entry.amount) }],
      payments: [{ label: entryLabel(entry), date: entry.receivedOn, amount: fixed(entry.amount) }],
      credits: [],
      receivedToDate: money(f.paid).minus(money(f.refunded)).toFixed(2),
      entryId: entry.id,
      covering,
    },
    transaction,
  );
}

/**
 * A card payment the provider confirmed, counted in the ledger with its receipt (inside the webhook's transaction,
 * under the quote's lock). The payment's unique ledger entry keeps it counted once whatever the deliveries.
 */
export async function recordCardPayment(quote: Quote, payment: Payment, purpose: 'deposit' | 'balance', transaction: Transaction): Promise<number | null> {
  const existing = await AccountEntry.findOne({ where: { paymentId: payment.id }, transaction });
  if (existing) return null;
  const entry = await AccountEntry.create(
    {
      quoteId: quote.id,
      kind: 'payment',
      method: 'card',
      amount: fromMinor(payment.amountReceivedMinor ?? payment.amountMinor, quote.currency),
      currency: quote.currency,
      receivedOn: localToday(payment.paidAt ?? new Date()),
      reference: payment.paymentIntent ?? payment.providerSessionId,
      note: purpose === 'deposit' ? 'Deposit' : 'Balance',
      paymentId: payment.id,
      creditNoteId: null,
      recordedBy: null,
    },
    { transaction },
  );
  // The deposit's receipt e-mail carries the owner's deposit-receipt message as its covering text.
  const covering =
    purpose === 'deposit'
      ? {
          kind: 'deposit-receipt' as const,
          body: (
            await fillTemplate(
              quote.sequelize!,
              await currentWorkshopId(transaction),
              'deposit-receipt',
              { customer: (await partyOf(quote, transaction)).customer.name, piece: await piecesOf(quote.sequelize!, quote.id, transaction), quote_number: quote.number, amount: formatMoney(fixed(entry.amount), quote.currency) },
              transaction,
            )
          ).body,
        }
      : null;
  const { outboxId } = await receiptFor(quote, entry, null, transaction, covering);
  return outboxId;
}

export interface BalanceOutcome {
  handled: boolean;
  flag?: 'duplicate' | 'amount-mismatch' | 'unknown-checkout';
  refund?: number;
  mail?: number;
}

/**
 * A completed checkout for the balance (the webhook's transaction; payment and quote locked by the caller). It
 * counts only when the amount is the checkout's and no more than is still owed; otherwise it is recorded, flagged,
 * and (when something else settled the balance meanwhile) refunded.
 */
export async function balanceCompleted(session: Stripe.Checkout.Session, payment: Payment, quote: Quote, transaction: Transaction): Promise<BalanceOutcome> {
  if (payment.status === 'paid' || payment.status === 'refunded') return { handled: true };
  const received = session.amount_total ?? 0;
  const paymentIntent = typeof session.payment_intent === 'string' ? session.payment_intent : (session.payment_intent?.id ?? null);
  const base = { status: 'paid' as const, paidAt: new Date(), paymentIntent, amountReceivedMinor: received, purpose: 'balance' as const };
  const f = await figuresOf(quote, transaction);
  const owed = minorUnits(f.balance, quote.currency);
  const currencyOk = String(session.currency ?? '').toLowerCase() === quote.currency.toLowerCase();
  if (!['accepted', 'deposit-paid'].includes(quote.state)) {
    await payment.update({ ...base, flag: 'unknown-checkout', note: `Paid while quote ${quote.number} is ${quote.state}: refunded.` }, { transaction });
    return { handled: true, flag: 'unknown-checkout', refund: payment.id };
  }
  if (!currencyOk || received !== Number(payment.amountMinor)) {
    await payment.update(
      { ...base, flag: 'amount-mismatch', note: `The provider took ${fromMinor(received, quote.currency)} ${String(session.currency ?? '').toUpperCase()}; the balance checkout was for ${fromMinor(payment.amountMinor, quote.currency)} ${quote.currency}. Not counted.` },
      { transaction },
    );
    await audit({ userId: null, action: 'payment.flag', entityType: 'quote', entityId: quote.id, after: { flag: 'amount-mismatch', session: session.id, amountMinor: received } }, transaction);
    return { handled: true, flag: 'amount-mismatch' };
  }
  if (received > owed) {
    await payment.update({ ...base, flag: 'duplicate', note: `Paid by card after the balance of quote ${quote.number} was settled otherwise (${f.balance} ${quote.currency} owed): refunded.` }, { transaction });
    await audit({ userId: null, action: 'payment.flag', entityType: 'quote', entityId: quote.id, after: { flag: 'duplicate', session: session.id, amountMinor: received } }, transaction);
    return { handled: true, flag: 'duplicate', refund: payment.id };
  }
  await payment.update({ ...base, flag: null, note: null }, { transaction });
  const mail = await recordCardPayment(quote, payment, 'balance', transaction);
  await audit({ userId: null, action: 'quote.balance_paid', entityType: 'quote', entityId: quote.id, after: { amountMinor: received, session: session.id } }, transaction);
  return { handled: true, ...(mail ? { mail } : {}) };
}

async function deliverAll(config: Config, ids: readonly (number | null)[]): Promise<void> {
  for (const id of ids) if (id) await deliver(config, id);
}

/**
 * Marks an accepted quote's deposit paid (the quote locked by the caller): the quote moves by the state table and the
 * estimates of the lines the customer chose follow it. The card webhook and a deposit recorded by hand both come here.
 */
export async function markDepositPaid(quote: Quote, transaction: Transaction, paidAt: Date = new Date()): Promise<void> {
  await quote.update({ state: moveQuote(quote.state, 'pay'), depositPaidAt: paidAt }, { transaction });
  const chosen = await QuoteLine.findAll({ where: { quoteId: quote.id, chosen: true }, attributes: ['estimateId'], transaction });
  await Estimate.update({ state: mirrorEstimate('accepted', 'pay') }, { where: { id: chosen.length ? chosen.map((l) => l.estimateId) : [quote.estimateId] }, transaction });
}

/**
 * Whether a payment recorded by hand on an accepted quote pays its deposit: the quote asks for one and what has been
 * received (less refunds), this payment included, reaches it.
 */
export function paysDeposit(quote: Pick<Quote, 'state' | 'acceptedDeposit'>, receivedAfter: string): boolean {
  if (quote.state !== 'accepted' || quote.acceptedDeposit === null) return false;
  const due = money(quote.acceptedDeposit);
  return due.gt(0) && money(receivedAfter).gte(due);
}

/**
 * Closes open checkouts at the provider once the account changed another way (best effort): the balance checkout,
 * and the deposit checkout too once the deposit was paid by hand (a card payment arriving after all is flagged as
 * paid twice and refunded by the webhook).
 */
async function closeBalanceCheckouts(config: Config, quoteId: number, depositToo = false): Promise<void> {
  const open = await Payment.findAll({ where: { quoteId, status: 'pending', ...(depositToo ? {} : { purpose: 'balance' }) } });
  for (const p of open) {
    try {
      const on = await accountOfPayment(p);
      if (!on) continue;
      await paymentClient(config).checkout.sessions.expire(p.providerSessionId, {}, onAccount(on));
      await Payment.update({ status: 'cancelled', closedAt: new Date() }, { where: { id: p.id, status: 'pending' } });
    } catch {
      /* already paid or gone: its webhook decides */
    }
  }
}

// ------------------------------------------------------------------------------------- staff: payments

/**
 * A bank transfer, cash or cheque recorded by hand, with its receipt; 400 naming `amount` when it is more than owed.
 * On an accepted quote whose deposit is unpaid, a payment that brings what was received up to the deposit pays the
 * deposit, exactly as the card checkout would: the quote moves to "deposit paid" and the open deposit checkout closes.
 */
export async function recordPayment(sequelize: Sequelize, config: Config, actorId: number, quoteId: number, input: RecordInput): Promise<AccountDto> {
  let depositPaid = false;
  const outboxId = await sequelize.transaction(async (transaction) => {
    const quote = await lockAccount(quoteId, transaction);
    const f = await figuresOf(quote, transaction);
    if (money(input.amount).gt(money(f.balance))) {
      throw problems.badRequest(
        'overpayment',
        money(f.balance).isZero()
          ? `amount: nothing is owed on quote ${quote.number}; a payment cannot be recorded`
          : `amount: is more than the ${formatMoney(f.balance, quote.currency)} still owed on quote ${quote.number}`,
        'amount',
      );
    }
    depositPaid = paysDeposit(quote, money(f.paid).minus(money(f.refunded)).plus(money(input.amount)).toFixed(2));
    const entry = await AccountEntry.create(
      {
        quoteId: quote.id,
        kind: 'payment',
        method: input.method,
        amount: fixed(input.amount),
        currency: quote.currency,
        receivedOn: input.receivedOn,
        reference: input.reference,
        // The receipt names it the deposit, as it does a deposit paid by card.
        note: depositPaid && !input.note ? 'Deposit' : input.note,
        paymentId: null,
        creditNoteId: null,
        recordedBy: actorId,
      },
      { transaction },
    );
    await audit({ userId: actorId, action: 'account.payment', entityType: 'quote', entityId: quote.id, after: { method: input.method, amount: entry.amount, receivedOn: input.receivedOn } }, transaction);
    if (depositPaid) {
      await markDepositPaid(quote, transaction);
      await audit({ userId: actorId, action: 'quote.deposit_paid', entityType: 'quote', entityId: quote.id, after: { method: input.method, amount: entry.amount, byHand: true } }, transaction);
    }
    const { outboxId } = await receiptFor(quote, entry, actorId, transaction);
    return outboxId;
  });
  await closeBalanceCheckouts(config, quoteId, depositPaid);
  await deliverAll(config, [outboxId]);
  return getAccount(quoteId);
}

// -------------------------------------------------------------------------------------- staff: invoices

async function workshopId(transaction?: Transaction): Promise<number> {
  const w = await currentWorkshop(transaction);
  if (!w) throw problems.notFound('The workshop');
  return w.id;
}

export async function getSettings(transaction?: Transaction): Promise<{ invoiceStage: InvoiceStage }> {
  const row = await AccountSetting.findByPk(await workshopId(transaction), { transaction });
  return { invoiceStage: row?.invoiceStage ?? 'finished' };
}

export async function updateSettings(sequelize: Sequelize, actorId: number, input: z.output<typeof AccountSettingsSchema>): Promise<{ invoiceStage: InvoiceStage }> {
  return sequelize.transaction(async (transaction) => {
    const id = await workshopId(transaction);
    const before = await getSettings(transaction);
    await AccountSetting.upsert({ workshopId: id, invoiceStage: input.invoiceStage }, { transaction });
    await audit({ userId: actorId, action: 'account.settings', entityType: 'workshop', entityId: id, before, after: input }, transaction);
    return { invoiceStage: input.invoiceStage };
  });
}

/** Why an invoice cannot be issued now (null when it can). */
async function invoiceBlock(quote: Quote, stage: InvoiceStage, transaction?: Transaction): Promise<string | null> {
  const existing = await AccountDocument.findOne({ where: { quoteId: quote.id, kind: 'invoice' }, attributes: ['number'], transaction });
  if (existing) return `Invoice ${existing.number} has already been issued for quote ${quote.number}; correct it with a credit note.`;
  if (!['accepted', 'deposit-paid'].includes(quote.state)) return `Quote ${quote.number} is ${quote.state}: only an accepted quote is invoiced.`;
  if (stage === 'deposit-paid' && quote.state !== 'deposit-paid') return `The workshop invoices once the deposit is paid: the deposit for quote ${quote.number} is not paid yet.`;
  if (stage === 'finished') {
    const jobs = await Job.findAll({ where: { quoteId: quote.id }, attributes: ['number', 'state'], transaction });
    const live = jobs.filter((j) => j.state !== 'cancelled');
    if (live.length === 0) return `The workshop invoices when the work is finished: quote ${quote.number} has no job yet.`;
    const open = live.filter((j) => j.state !== 'finished');
    if (open.length) return `The workshop invoices when the work is finished: ${open.map((j) => j.number).join(', ')} ${open.length === 1 ? 'is' : 'are'} not finished.`;
  }
  return null;
}

/** Issues the tax invoice for an agreement: the work and extras agreed, the tax in them, payments deducted, the balance due. */
export async function issueInvoice(sequelize: Sequelize, config: Config, actorId: number, quoteId: number, input: InvoiceInput): Promise<AccountDto> {
  // What was agreed is read before the transaction (it never changes once accepted).
  const record = await acceptanceRecordOf(quoteId);
  const outboxId = await sequelize.transaction(async (transaction) => {
    const quote = await lockAccount(quoteId, transaction);
    const { invoiceStage } = await getSettings(transaction);
    const blocked = await invoiceBlock(quote, invoiceStage, transaction);
    if (blocked) throw problems.conflict('invoice_not_due', blocked);
    const party = await partyOf(quote, transaction);
    const tax = await taxOf(transaction);
    const f = await figuresOf(quote, transaction);
    const entries = await AccountEntry.findAll({ where: { quoteId: quote.id }, order: [['receivedOn', 'ASC'], ['id', 'ASC']], transaction });
    const lines: DocumentContent['lines'] = record.choices
      ? record.choices.map((c) => ({ description: c.piece, note: c.option, amount: fixed(c.total) }))
      : [{ description: record.piece, note: `${record.systemName}, as quoted in ${record.quoteNumber}`, amount: fixed(record.quotedTotal) }];
    for (const x of record.extrasTaken) lines.push({ description: `Extra: ${x.label}`, amount: fixed(x.price) });
    for (const v of await approvedVariations(quote.id, transaction)) lines.push({ description: `Variation: ${v.title}`, note: v.description || undefined, amount: fixed(v.price) });
    // The lines are the agreed total; any difference (an agreement recorded otherwise) shows as its own line.
    const diff = money(f.agreedTotal).minus(sumMoney(lines.map((l) => l.amount)));
    if (!diff.isZero()) lines.push({ description: 'Agreed adjustment', amount: diff.toFixed(2) });
    const { outboxId } = await issue(
      {
        kind: 'invoice',
        quote,
        party,
        actorId,
        total: f.agreedTotal,
        taxPct: tax.pct,
        taxLabel: tax.label,
        balanceDue: f.balance,
        agreedTotal: f.agreedTotal,
        lines,
        payments: entries.map((e) => ({ label: entryLabel(e), date: e.receivedOn, amount: e.kind === 'refund' ? money(e.amount).negated().toFixed(2) : fixed(e.amount) })),
        credits: [],
        receivedToDate: money(f.paid).minus(money(f.refunded)).toFixed(2),
        note: input.note,
        // With a balance still to pay, the invoice e-mail is the owner's balance-due message too.
        covering: money(f.balance).isZero()
          ? null
          : {
              kind: 'balance-due',
              body: (
                await fillTemplate(
                  sequelize,
                  await currentWorkshopId(transaction),
                  'balance-due',
                  { customer: party.customer.name, piece: await piecesOf(sequelize, quote.id, transaction), quote_number: quote.number, amount: formatMoney(f.balance, quote.currency) },
                  transaction,
                )
              ).body,
            },
      },
      transaction,
    );
    return outboxId;
  });
  await deliverAll(config, [outboxId]);
  return getAccount(quoteId);
}

/**
 * "Send a reminder" from the owed list: the owner's balance-due message, filled in with what is still owed today,
 * put in the outbox with its job on the message queue, sent at once where the mail server answers (the queue retries
 * it otherwise), and listed with the customer's messages. One a day per invoice (its key
 * names the invoice and the day: a second press the same day is a 409 naming the message); refused when no invoice
 * was issued, nothing is owed, or the customer has no e-mail address.
 */
export async function sendBalanceReminder(sequelize: Sequelize, config: Config, actorId: number, quoteId: number): Promise<{ outboxId: number; status: string; to: string; amount: string; currency: string }> {
  const made = await sequelize.transaction(async (transaction) => {
    const quote = await lockAccount(quoteId, transaction);
    const invoice = await AccountDocument.findOne({ where: { quoteId: quote.id, kind: 'invoice' }, attributes: ['id', 'number'], transaction });
    if (!invoice) throw problems.conflict('no_invoice', `No invoice has been issued for quote ${quote.number}: a reminder asks for the balance of an invoice.`);
    const f = await figuresOf(quote, transaction);
    if (!money(f.balance).greaterThan(0)) throw problems.conflict('nothing_owed', `Invoice ${invoice.number} is paid: nothing is owed, so there is nothing to remind the customer of.`);
    const day = localToday();
    const dedupeKey = `balance-reminder:invoice:${invoice.id}:${day}`;
    const existing = await OutboxMessage.findOne({ where: { dedupeKey }, attributes: ['id', 'status'], transaction });
    if (existing) throw problems.conflict('already_reminded', `The customer was already reminded of invoice ${invoice.number} today (message ${existing.id}, ${existing.status}).`);
    const party = await partyOf(quote, transaction);
    if (!party.to) throw problems.badRequest('no_recipient', `${party.customer.name} has no e-mail address: add one on the customer's page first.`, 'email');
    const amount = formatMoney(f.balance, quote.currency);
    const jobs = await Job.findAll({ where: { quoteId: quote.id }, attributes: ['id'], order: [['id', 'ASC']], transaction });
    const outboxId = await queueCustomerMessage(
      sequelize,
      {
        workshopId: await currentWorkshopId(transaction),
        kind: 'balance-due',
        customerId: party.customer.id,
        quoteId: quote.id,
        jobId: jobs.length === 1 ? jobs[0]!.id : null,
        values: { piece: await piecesOf(sequelize, quote.id, transaction), quote_number: quote.number, amount },
        to: party.to,
        dedupeKey,
        // Sent below, at once; the queue's job is the backstop a minute later (it finds the message sent and does
        // nothing, or retries it when the mail server did not take it), so the two never race for it.
        sendAfter: new Date(Date.now() + 60_000),
        actorId,
      },
      transaction,
    );
    if (outboxId === null) throw problems.conflict('already_reminded', `The customer was already reminded of invoice ${invoice.number} today.`);
    await audit({ userId: actorId, action: 'account.balance-reminder', entityType: 'quote', entityId: quote.id, after: { invoice: invoice.number, balance: f.balance, outboxId } }, transaction);
    return { outboxId, to: party.to, amount: f.balance, currency: quote.currency };
  });
  // Sent at once where the mail server answers (as the ready message is); the queue's job retries it when it did not.
  const m = await deliver(config, made.outboxId);
  return { ...made, status: m.status };
}

/** An issued invoice (or any issued document) is never edited: always a 409 saying what to do instead. */
export async function refuseEdit(id: number): Promise<never> {
  const doc = await AccountDocument.findByPk(id, { attributes: ['id', 'number', 'kind', 'issuedAt'] });
  if (!doc) throw problems.notFound('Document');
  throw problems.conflict(
    'document_issued',
    `${DOCUMENT_KIND_LABELS[doc.kind]} ${doc.number} was issued on ${formatDate(localToday(doc.issuedAt))}: an issued document is never changed. ${doc.kind === 'credit-note' ? 'Issue another credit note or a new invoice.' : 'Correct it with a credit note.'}`,
  );
}

/**
 * A credit note against an invoice: reduces what is owed by its amount (at most what the invoice still carries).
 * When the credit is more than is still owed, the difference has been paid and must be given back: `refund` says
 * how, and the refund goes in the ledger.
 */
export async function issueCreditNote(sequelize: Sequelize, config: Config, actorId: number, invoiceId: number, input: CreditInput): Promise<AccountDto> {
  const invoicePeek = await AccountDocument.findByPk(invoiceId, { attributes: ['id', 'quoteId', 'kind', 'number'] });
  if (!invoicePeek || invoicePeek.kind !== 'invoice') throw problems.notFound('Invoice');
  const outboxId = await sequelize.transaction(async (transaction) => {
    const quote = await lockAccount(invoicePeek.quoteId, transaction);
    const invoice = (await AccountDocument.findByPk(invoiceId, { transaction }))!;
    const credited = await AccountDocument.findAll({ where: { invoiceId, kind: 'credit-note' }, attributes: ['total'], transaction });
    const left = money(invoice.total).minus(sumMoney(credited.map((c) => c.total)));
    const amount = money(input.amount);
    if (amount.gt(left)) {
      throw problems.badRequest('credit_too_large', `amount: is more than the ${formatMoney(left.toFixed(2), quote.currency)} invoice ${invoice.number} still carries`, 'amount');
    }
    const f = await figuresOf(quote, transaction);
    const excess = amount.minus(money(f.balance));
    if (excess.gt(0) && !input.refund) {
      throw problems.badRequest(
        'refund_required',
        `refund: the credit is ${formatMoney(excess.toFixed(2), quote.currency)} more than is still owed, so that much has been paid and must be given back; say how it is refunded`,
        'refund',
      );
    }
    if (excess.lte(0) && input.refund) {
      throw problems.badRequest('refund_not_due', `refund: nothing is refunded, because ${formatMoney(f.balance, quote.currency)} is still owed and the credit only reduces it`, 'refund');
    }
    const party = await partyOf(quote, transaction);
    const balanceAfter = excess.gt(0) ? '0.00' : money(f.balance).minus(amount).toFixed(2);
    const refund = excess.gt(0) && input.refund ? { method: methodWords(input.refund.method), amount: excess.toFixed(2) } : null;
    const { doc, outboxId } = await issue(
      {
        kind: 'credit-note',
        quote,
        party,
        actorId,
        total: amount.toFixed(2),
        taxPct: Number(invoice.taxPct),
        taxLabel: invoice.taxLabel,
        balanceDue: balanceAfter,
        agreedTotal: f.agreedTotal,
        lines: [{ description: `Credit against invoice ${invoice.number}`, note: input.reason, amount: amount.toFixed(2) }],
        payments: refund ? [{ label: `Refunded by ${refund.method}`, date: localToday(), amount: money(refund.amount).negated().toFixed(2) }] : [],
        credits: [],
        receivedToDate: money(f.paid).minus(money(f.refunded)).minus(refund ? money(refund.amount) : 0).toFixed(2),
        reason: input.reason,
        invoice,
        refund,
      },
      transaction,
    );
    if (refund && input.refund) {
      await AccountEntry.create(
        {
          quoteId: quote.id,
          kind: 'refund',
          method: input.refund.method,
          amount: refund.amount,
          currency: quote.currency,
          receivedOn: localToday(),
          reference: input.refund.reference,
          note: `Refund with credit note ${doc.number}`,
          paymentId: null,
          creditNoteId: doc.id,
          recordedBy: actorId,
        },
        { transaction },
      );
    }
    return outboxId;
  });
  await deliverAll(config, [outboxId]);
  return getAccount(invoicePeek.quoteId);
}

// -------------------------------------------------------------------------------------------- reading

function documentDto(d: AccountDocument, outbox: Map<number, OutboxMessage>, numbers: Map<number, string>): AccountDocumentDto {
  const m = d.outboxId ? outbox.get(d.outboxId) : undefined;
  return {
    id: d.id,
    kind: d.kind,
    number: d.number,
    issuedAt: d.issuedAt.toISOString(),
    total: fixed(d.total),
    net: fixed(d.net),
    tax: fixed(d.tax),
    taxLabel: d.taxLabel,
    taxPct: Number(d.taxPct),
    balanceDue: fixed(d.balanceDue),
    reason: d.reason,
    againstNumber: d.invoiceId ? (numbers.get(d.invoiceId) ?? null) : null,
    mail: m ? { status: m.status, to: m.toAddress } : null,
  };
}

export async function getAccount(quoteId: number): Promise<AccountDto> {
  const quote = await Quote.findByPk(quoteId);
  if (!quote) throw problems.notFound('Quote');
  if (quote.acceptedTotal === null) throw problems.conflict('not_agreed', `Quote ${quote.number} is ${quote.state}: only an accepted quote has an account.`);
  const estimate = await Estimate.findByPk(quote.estimateId, { attributes: ['id', 'customerId'] });
  const [customer, jobs, docs, entries, figures, settings] = await Promise.all([
    Customer.findByPk(estimate!.customerId, { attributes: ['id', 'name', 'email'] }),
    Job.findAll({ where: { quoteId }, attributes: ['id', 'number', 'state', 'title'], order: [['id', 'ASC']] }),
    AccountDocument.findAll({ where: { quoteId }, order: [['issuedAt', 'ASC'], ['id', 'ASC']] }),
    AccountEntry.findAll({ where: { quoteId }, order: [['receivedOn', 'ASC'], ['id', 'ASC']] }),
    figuresOf(quote),
    getSettings(),
  ]);
  const outboxIds = docs.map((d) => d.outboxId).filter((x): x is number => x !== null);
  const outbox = new Map((outboxIds.length ? await OutboxMessage.findAll({ where: { id: outboxIds }, attributes: ['id', 'status', 'toAddress'] }) : []).map((m) => [m.id, m]));
  const numbers = new Map(docs.map((d) => [d.id, d.number]));
  const userIds = [...new Set(entries.map((e) => e.recordedBy).filter((x): x is number => x !== null))];
  const users = new Map((userIds.length ? await User.findAll({ where: { id: userIds }, attributes: ['id', 'name'] }) : []).map((u) => [u.id, u.name]));
  const invoice = docs.find((d) => d.kind === 'invoice');
  const why = await invoiceBlock(quote, settings.invoiceStage);
  return {
    quote: { id: quote.id, number: quote.number, state: quote.state, customer: { id: customer!.id, name: customer!.name, email: customer!.email } },
    jobs: jobs.map((j) => ({ id: j.id, number: j.number, state: j.state, title: j.title })),
    figures,
    invoiceStage: settings.invoiceStage,
    invoice: { issued: invoice?.number ?? null, canIssue: why === null, why: invoice ? null : why },
    documents: docs.map((d) => documentDto(d, outbox, numbers)),
    entries: entries.map(
      (e): LedgerEntryDto => ({
        id: e.id,
        kind: e.kind,
        method: e.method,
        amount: fixed(e.amount),
        receivedOn: e.receivedOn,
        reference: e.reference,
        note: e.note,
        receiptNumber: docs.find((d) => d.entryId === e.id)?.number ?? null,
        creditNoteNumber: e.creditNoteId ? (numbers.get(e.creditNoteId) ?? null) : null,
        recordedBy: e.recordedBy ? (users.get(e.recordedBy) ?? null) : null,
        createdAt: e.createdAt.toISOString(),
      }),
    ),
  };
}

export async function documentPdf(id: number): Promise<{ number: string; pdf: Buffer }> {
  const doc = await AccountDocument.findByPk(id);
  if (!doc) throw problems.notFound('Document');
  return { number: doc.number, pdf: await renderAccountPdf(doc.content) };
}

// ---------------------------------------------------------------------------------------------- owed list

const OWED_SORT: Record<OwedQuery['sort'], string> = {
  age: 'age_days',
  balance: 'balance',
  customer: 'customer_name',
  invoice: 'invoice_number',
};

/** Agreements invoiced and not fully paid, with how old the invoice is; sorted, paged, with bucket totals. */
export async function listOwed(q: OwedQuery): Promise<OwedPage> {
  const sequelize = Quote.sequelize!;
  // Ages count the workshop's own days: the invoice's day and today, both in the workshop's time zone.
  const { settings } = await loadSettings();
  const tz = settings.timeZone ?? DEFAULT_TIME_ZONE;
  const day = { tz, today: today(tz) };
  const base = `
    WITH owed AS (
      SELECT d.quote_id, d.number AS invoice_number, d.issued_at, d.total AS invoiced, d.currency, d.customer_id,
             q.number AS quote_number, c.name AS customer_name,
             q.accepted_total
               + COALESCE((SELECT sum(v.price) FROM job_variations v WHERE v.quote_id = d.quote_id AND v.state = 'approved'), 0)
               - COALESCE((SELECT sum(x.total) FROM account_documents x WHERE x.quote_id = d.quote_id AND x.kind = 'credit-note'), 0)
               - COALESCE((SELECT sum(e.amount) FROM account_entries e WHERE e.quote_id = d.quote_id AND e.kind = 'payment'), 0)
               + COALESCE((SELECT sum(e.amount) FROM account_entries e WHERE e.quote_id = d.quote_id AND e.kind = 'refund'), 0) AS balance,
             (:today::date - (d.issued_at AT TIME ZONE :tz)::date) AS age_days
        FROM account_documents d
        JOIN quotes q ON q.id = d.quote_id
        JOIN customers c ON c.id = d.customer_id
       WHERE d.kind = 'invoice')
    SELECT * FROM owed WHERE balance > 0`;
  const bucketWhere = q.bucket === '0-30' ? ' AND age_days <= 30' : q.bucket === '31-60' ? ' AND age_days BETWEEN 31 AND 60' : q.bucket === '60+' ? ' AND age_days > 60' : '';
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const rows = await sequelize.query<{
    quote_id: number;
    quote_number: string;
    invoice_number: string;
    issued_at: Date;
    invoiced: string;
    currency: string;
    customer_id: number;
    customer_name: string;
    balance: string;
    age_days: number;
  }>(`${base}${bucketWhere} ORDER BY ${OWED_SORT[q.sort]} ${dir}, quote_id ${dir} LIMIT :limit OFFSET :offset`, {
    replacements: { ...day, limit: q.pageSize, offset: offset(q.page, q.pageSize) },
    type: QueryTypes.SELECT,
  });
  const total = await pageTotal(rows.length, q, async (limit) => {
    const [row] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM (${base}${bucketWhere} LIMIT :limit) t`, { replacements: { ...day, limit }, type: QueryTypes.SELECT });
    return Number(row?.n ?? 0);
  });
  const buckets = await sequelize.query<{ bucket: string; currency: string; n: string; amount: string }>(
    `SELECT CASE WHEN age_days <= 30 THEN '0-30' WHEN age_days <= 60 THEN '31-60' ELSE '60+' END AS bucket, currency, count(*) AS n, sum(balance) AS amount
       FROM (${base}) t GROUP BY 1, 2 ORDER BY 1, 2`,
    { replacements: day, type: QueryTypes.SELECT },
  );
  return {
    rows: rows.map((r) => ({
      quoteId: r.quote_id,
      quoteNumber: r.quote_number,
      invoiceNumber: r.invoice_number,
      invoicedOn: dayOf(new Date(r.issued_at), tz),
      ageDays: Number(r.age_days),
      bucket: ageingBucket(Number(r.age_days)),
      customer: { id: r.customer_id, name: r.customer_name },
      currency: r.currency,
      invoiced: fixed(r.invoiced),
      balance: fixed(r.balance),
    })),
    ...total,
    page: q.page,
    pageSize: q.pageSize,
    buckets: buckets.map((b) => ({ bucket: b.bucket as OwedPage['buckets'][number]['bucket'], currency: b.currency, count: Number(b.n), amount: fixed(b.amount) })),
  };
}

// ------------------------------------------------------------------------------------------- customer side

const linkInvalid = () => new HttpProblem(404, 'link_invalid', 'Link not valid', 'This quote link is not valid. Check that the whole address was copied, or ask the workshop for a new link.');

async function quoteByToken(config: Config, token: string): Promise<Quote> {
  if (!tokenSigned(token, config.linkSecret)) throw linkInvalid();
  const quote = await Quote.findOne({ where: { tokenHash: hashToken(token) } });
  if (!quote || quote.state === 'draft') throw linkInvalid();
  return quote;
}

function notAgreedYet(quote: Quote): HttpProblem {
  return new HttpProblem(409, 'not_accepted', 'Accept first', `Quote ${quote.number} has not been accepted: there is nothing to pay yet.`);
}

/** The customer's account through their link: figures and documents in plain words, and whether they can pay now. */
export async function publicAccount(config: Config, token: string): Promise<PublicAccount> {
  const quote = await quoteByToken(config, token);
  if (quote.acceptedTotal === null || !['accepted', 'deposit-paid'].includes(quote.state)) throw notAgreedYet(quote);
  await lapseCheckouts(quote.id);
  const cards = await cardPaymentsReady(config);
  const [f, docs, open] = await Promise.all([
    figuresOf(quote),
    AccountDocument.findAll({ where: { quoteId: quote.id }, attributes: ['id', 'kind', 'number', 'issuedAt', 'total'], order: [['issuedAt', 'ASC'], ['id', 'ASC']] }),
    Payment.findOne({ where: { quoteId: quote.id, status: 'pending', purpose: 'balance' }, attributes: ['id'] }),
  ]);
  return {
    currency: quote.currency,
    agreedTotal: f.agreedTotal,
    paid: money(f.paid).minus(money(f.refunded)).toFixed(2),
    credited: f.credited,
    balance: f.balance,
    canPay: quote.state === 'deposit-paid' && money(f.balance).gt(0) && cards,
    cardPayments: cards,
    checkoutOpen: open !== null,
    documents: docs.map((d) => ({ id: d.id, kind: d.kind, number: d.number, issuedOn: localToday(d.issuedAt), total: fixed(d.total) })),
  };
}

/** A document's PDF through the customer's link (only the documents of that quote). */
export async function publicDocumentPdf(config: Config, token: string, id: number): Promise<{ number: string; pdf: Buffer }> {
  const quote = await quoteByToken(config, token);
  const doc = await AccountDocument.findOne({ where: { id, quoteId: quote.id } });
  if (!doc) throw problems.notFound('Document');
  return { number: doc.number, pdf: await renderAccountPdf(doc.content) };
}

/**
 * The card checkout for the whole balance still owed: the open one when its amount is still right, else a new one
 * (under the quote's lock; the database keeps one open checkout per quote).
 */
export async function balanceCheckout(sequelize: Sequelize, config: Config, token: string): Promise<{ url: string; reused: boolean }> {
  const found = await quoteByToken(config, token);
  const customerEmail = found.recipient;
  return sequelize.transaction(async (transaction) => {
    const quote = (await Quote.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (quote.acceptedTotal === null || !['accepted', 'deposit-paid'].includes(quote.state)) throw notAgreedYet(quote);
    if (quote.state !== 'deposit-paid') throw new HttpProblem(409, 'deposit_first', 'Deposit first', 'Pay the deposit first; the balance follows when the work is done.');
    const f = await figuresOf(quote, transaction);
    const amount = minorUnits(f.balance, quote.currency);
    if (amount <= 0) throw new HttpProblem(409, 'nothing_owed', 'Nothing owed', `Nothing is owed on quote ${quote.number}: thank you.`);
    // The balance is taken on the workshop's own account with the provider (409 while it has none ready).
    const account = await workshopPaymentAccount(transaction);
    await lapseCheckouts(quote.id, transaction);
    const open = await Payment.findOne({ where: { quoteId: quote.id, status: 'pending' }, transaction });
    if (open && open.purpose === 'balance' && Number(open.amountMinor) === amount && open.checkoutUrl && (open.providerAccountId ?? account) === account) {
      return { url: open.checkoutUrl, reused: true };
    }
    const stripe = paymentClient(config);
    if (open) {
      const on = await accountOfPayment(open, transaction);
      if (on) await stripe.checkout.sessions.expire(open.providerSessionId, {}, onAccount(on)).catch(() => undefined);
      await open.update({ status: 'cancelled', closedAt: new Date() }, { transaction });
    }
    const returnUrl = quoteLink(config, token);
    let session: Stripe.Checkout.Session;
    try {
      session = await stripe.checkout.sessions.create({
        mode: 'payment',
        line_items: [{ quantity: 1, price_data: { currency: quote.currency.toLowerCase(), unit_amount: amount, product_data: { name: `Balance for quote ${quote.number}` } } }],
        success_url: `${returnUrl}?balance=paid`,
        cancel_url: `${returnUrl}?balance=cancelled`,
        client_reference_id: quote.number,
        expires_at: Math.floor(Date.now() / 1000) + CHECKOUT_MINUTES * 60,
        ...(customerEmail ? { customer_email: customerEmail } : {}),
        metadata: { quote_id: String(quote.id), quote_number: quote.number, purpose: 'balance' },
      }, onAccount(account));
    } catch (err) {
      throw new HttpProblem(502, 'payments_unreachable', 'Payment service unavailable', `The payment service did not answer: ${err instanceof Error ? err.message : String(err)}. Try again in a moment.`);
    }
    if (!session.url) throw new HttpProblem(502, 'payments_unreachable', 'Payment service unavailable', 'The payment service gave no checkout address.');
    await Payment.create(
      {
        quoteId: quote.id,
        providerSessionId: session.id,
        amountMinor: amount,
        currency: quote.currency,
        paidAt: null,
        checkoutUrl: session.url,
        expiresAt: session.expires_at ? new Date(session.expires_at * 1000) : new Date(Date.now() + CHECKOUT_MINUTES * 60_000),
        purpose: 'balance',
        providerAccountId: account,
      },
      { transaction },
    );
    await audit({ userId: null, action: 'quote.balance_checkout', entityType: 'quote', entityId: quote.id, after: { session: session.id, amountMinor: amount } }, transaction);
    return { url: session.url, reused: false };
  });
}
