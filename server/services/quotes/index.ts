/**
 * Quotes: a priced estimate's revision offered to the customer, with a covering message, optional extras, a
 * discount within the owner's cap, a validity date and a deposit. Each job lives in its own file; this index keeps
 * the names routes and other services import.
 */
export { makeToken, hashToken, tokenSigned, quoteLink } from './links';
export { quotePricing, combinedPricing, shownPricing, acceptedAmounts, agreedOf } from './pricing';
export { pieceAgreement, alreadyAgreed, linesOf, lockPieces, lockQuote } from './locks';
export { lineDtos, getQuote, openQuotesNaming, listQuotes } from './read';
export { createQuote } from './create';
export { sendQuote, markSent, withdrawQuote } from './lifecycle';
export { pipeline, optionReport } from './reports';
export { buildDocument, bookedSchedule, estimateDocument, acceptanceRecordOf } from './document';
export { expireQuotes } from '../quote-expiry';
