/**
 * Agreements and locks: whether a piece is already agreed, and the row locks every quote write takes in one order.
 */
import { dayOf } from '@shared/time';
import { Op, type Transaction } from 'sequelize';
import { HttpProblem, problems } from '../../http/problem';
import { Estimate, Piece, Quote, QuoteLine } from '../../models';
import { allOf } from '../../db/queries';

export async function pieceAgreement(pieceIds: readonly number[], transaction?: Transaction): Promise<{ line: QuoteLine; quote: Quote } | null> {
  if (pieceIds.length === 0) return null;
  const line = await QuoteLine.findOne({ where: { pieceId: { [Op.in]: [...pieceIds] }, agreed: true }, transaction });
  if (!line) return null;
  const quote = await Quote.findByPk(line.quoteId, { transaction });
  return quote ? { line, quote } : null;
}

/** The problem for a piece already agreed: 409 naming the accepted quote (and the estimate it was agreed on). */
export async function alreadyAgreed(found: { line: QuoteLine; quote: Quote }, ownEstimateIds: readonly number[], transaction?: Transaction): Promise<HttpProblem> {
  const { line, quote: agreed } = found;
  const [estimate, piece] = await allOf(transaction, [() => Estimate.findByPk(line.estimateId, { transaction }), () => Piece.findByPk(line.pieceId, { transaction })]);
  const on = agreed.acceptedAt ? ` on ${dayOf(agreed.acceptedAt)}` : '';
  if (ownEstimateIds.includes(line.estimateId)) {
    return new HttpProblem(409, 'estimate_already_agreed', 'Already agreed', `Quote ${agreed.number} for estimate ${estimate?.number ?? line.estimateId} was accepted${on}: no other quote for it can be sent or accepted.`);
  }
  return new HttpProblem(
    409,
    'piece_already_agreed',
    'Already agreed',
    `Quote ${agreed.number} for ${piece?.description ?? 'the piece'} (estimate ${estimate?.number ?? line.estimateId}) was accepted${on}: no other quote for that piece can be sent or accepted.`,
  );
}

/** A quote's lines in their order. */
export async function linesOf(quoteId: number, transaction?: Transaction): Promise<QuoteLine[]> {
  return QuoteLine.findAll({ where: { quoteId }, order: [['position', 'ASC']], transaction });
}

/**
 * Locks the pieces named, in id order (NO KEY UPDATE: rows that merely reference a piece are not held up). Two quotes
 * naming one piece through different estimates queue here.
 */
export async function lockPieces(pieceIds: readonly number[], transaction: Transaction): Promise<void> {
  for (const id of [...new Set(pieceIds)].sort((a, b) => a - b)) {
    await Piece.findByPk(id, { attributes: ['id'], transaction, lock: transaction.LOCK.NO_KEY_UPDATE });
  }
}

/**
 * Locks a quote for a change of state, its pieces and estimates first: every transaction that moves a quote takes
 * the rows of the pieces its lines name, then of their estimates (each in id order), then the quote's, so two of
 * them never wait on each other in opposite order. `estimate` is the quote's first estimate.
 */
export async function lockQuote(quoteId: number, transaction: Transaction): Promise<{ quote: Quote; estimate: Estimate; estimates: Estimate[]; lines: QuoteLine[] }> {
  const peek = await Quote.findByPk(quoteId, { attributes: ['id', 'estimateId'], transaction });
  if (!peek) throw problems.notFound('Quote');
  const lines = await linesOf(quoteId, transaction);
  await lockPieces(lines.map((l) => l.pieceId), transaction);
  const ids = [...new Set([peek.estimateId, ...lines.map((l) => l.estimateId)])].sort((a, b) => a - b);
  const estimates: Estimate[] = [];
  for (const id of ids) {
    const e = await Estimate.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (e) estimates.push(e);
  }
  const quote = await Quote.findByPk(quoteId, { transaction, lock: transaction.LOCK.UPDATE });
  const estimate = estimates.find((e) => e.id === peek.estimateId);
  if (!estimate || !quote) throw problems.notFound('Quote');
  return { quote, estimate, estimates, lines };
}
