/**
 * Everything a quote PDF shows, gathered by the quotes service from the database and the estimate's revision.
 * Amounts are decimal strings in the quote's currency; dates are local 'YYYY-MM-DD'.
 */
export interface QuoteDocument {
  paperSize: 'A4' | 'Letter';
  workshop: { name: string; address: string | null; email: string | null; phone: string | null };
  quote: {
    /** The quote's own reference, e.g. "Q-2027-0007". */
    number: string;
    estimateNumber: string;
    issuedOn: string;
    validUntil: string;
    /** The salesperson's covering message (may be several paragraphs). */
    message: string;
    currency: string;
    /** Whether amounts are shown with tax included (the breakdown shows the tax either way). */
    pricesIncludeTax: boolean;
    taxLabel: string;
    preparedBy: string;
  };
  customer: { name: string; address: string | null; email: string | null; phone: string | null };
  piece: {
    description: string;
    kind: string;
    maker: string | null;
    /** The year as written ("c. 1830", "1890s"). */
    year: string | null;
    serial: string | null;
    /** One condition photo (JPEG or PNG bytes), if the piece has one. */
    photo: Buffer | null;
    photoCaption: string | null;
  };
  work: {
    systemName: string;
    areaM2: number;
    /** Area already formatted in the workshop's units, e.g. "8.83 m²" or "95.1 ft²". */
    areaText: string;
    totalCoats: number;
    labourHours: number;
    calendarDays: number;
    /** First session and the day the piece is ready: only once the job is booked (datesBooked), never promised before. */
    startDate: string | null;
    readyDate: string | null;
    datesBooked: boolean;
    /** Coats is null for a stage that lays no coat; hours are rounded for reading. */
    stages: { name: string; sessions: number; coats: number | null; hours: number; restText: string }[];
  };
  price: {
    /** The customer's breakdown (materials, the work, discount, tax, rounding): never the rate, overhead or margin. */
    lines: { label: string; amount: string }[];
    total: string;
    depositPct: number;
    deposit: string;
    balance: string;
    /** Once accepted: the extras taken and the agreed total (deposit and balance above are then on it). */
    agreed: { extras: { label: string; price: string }[]; total: string } | null;
  };
  /**
   * A quote of several pieces or with options: each line (an option for one piece), in the quote's order. The piece
   * and work above are then the first line's; the price is for the recommended choice (or, once accepted, the
   * customer's choice). Absent or of one line for a quote of one piece.
   */
  lines?: QuoteDocumentLine[];
  /** Optional extra work the customer may accept or not, priced separately (not in the total above). */
  extras: { label: string; description: string; hours: number; price: string }[];
  terms: string[];
  cautions: { code: string; severity: string; text: string }[];
  /** A sentence with the ventilation figure, e.g. "fresh air of at least 1 740 m³/h while polishing". */
  ventilationText: string;
}

export interface QuoteDocumentLine {
  /** Lines with the same group are options for one piece. */
  group: number;
  groupOptional: boolean;
  /** How many options the group offers. */
  options: number;
  label: string;
  recommended: boolean;
  /** Taken at acceptance (null before). */
  chosen: boolean | null;
  piece: QuoteDocument['piece'];
  work: QuoteDocument['work'];
  total: string;
}
