/**
 * Every e-mail the product sends is laid out here, in one order: one greeting, the covering message, the product's
 * own paragraphs, then one sign-off. A covering message typed with its own greeting or sign-off has them taken off,
 * so the customer never reads "Dear …" twice or a signature in the middle of the letter.
 */

export interface MailParagraph {
  text: string;
  /** A link shown after the text (as an address in the plain text, as a link in HTML). */
  link?: { url: string; label: string };
  /** Small print (safety notes). */
  small?: boolean;
}

export interface MailParts {
  /** Whom the greeting names. */
  name: string;
  /** The covering message typed by staff (may be empty, may be several paragraphs). */
  message: string;
  paragraphs: MailParagraph[];
  signOff: { from: string | null; workshop: string; phone: string | null; email: string | null };
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** A greeting line: the word and a name of a few words, nothing after ("Dear Mrs Quill,", "Hello!"). */
const GREETING = /^\s*(dear|hello|hi|hey|good (morning|afternoon|evening)|greetings)(\s+[\w.'’-]+){0,4}\s*[,:!]?\s*$/i;
const PHRASE = '(kind(est)? regards|best regards|warm regards|regards|best wishes|with best wishes|many thanks|with thanks|thanks|thank you|yours (sincerely|faithfully|truly)|sincerely|all the best|cheers)';
/** A sign-off line: the phrase alone ("Kind regards,"), or with a few words and a comma ("With thanks from us all,"). */
const SIGN_OFF = new RegExp(`^\\s*(${PHRASE}\\s*[,.!]?|${PHRASE}(\\s+[\\w'’]+){1,4},)\\s*$`, 'i');

/**
 * The covering message without a greeting on its first line or a sign-off (and the name lines under it) at its end.
 *
 * @example coveringMessage('Dear Ann,\n\nThank you.\n\nKind regards,\nBen') // "Thank you."
 */
export function coveringMessage(message: string): string {
  const lines = message.replace(/\r\n?/g, '\n').split('\n');
  while (lines.length && lines[0]!.trim() === '') lines.shift();
  if (lines.length && GREETING.test(lines[0]!)) lines.shift();
  // The last sign-off within the last four lines ends the message: it and the name lines under it go. A line with
  // nothing written before it is the message itself, not a sign-off.
  for (let i = lines.length - 1; i >= Math.max(0, lines.length - 4); i--) {
    if (SIGN_OFF.test(lines[i]!) && lines.slice(0, i).some((l) => l.trim() !== '')) {
      lines.splice(i);
      break;
    }
  }
  return lines.join('\n').trim();
}

/** The plain text and HTML of a message, in the house order. */
export function composeMail(parts: MailParts): { text: string; html: string } {
  const message = coveringMessage(parts.message);
  const messageParas = message ? message.split(/\n{2,}/).map((p) => p.trim()).filter(Boolean) : [];
  const s = parts.signOff;
  const signature = [s.from, s.workshop, s.phone, s.email].filter((x): x is string => Boolean(x && x.trim()));

  const text = [
    `Dear ${parts.name},`,
    ...messageParas,
    ...parts.paragraphs.map((p) => (p.link ? `${p.text}\n${p.link.url}` : p.text)),
    ['Kind regards,', ...signature].join('\n'),
  ].join('\n\n') + '\n';

  const html = [
    `<p>Dear ${escapeHtml(parts.name)},</p>`,
    ...messageParas.map((p) => `<p>${escapeHtml(p).replace(/\n/g, '<br>')}</p>`),
    ...parts.paragraphs.map((p) =>
      p.link
        ? `<p><a href="${escapeHtml(p.link.url)}">${escapeHtml(p.link.label)}</a></p>`
        : `<p${p.small ? ' style="font-size:12px;color:#66412c"' : ''}>${escapeHtml(p.text)}</p>`,
    ),
    `<p>Kind regards,<br>${signature.map(escapeHtml).join('<br>')}</p>`,
  ].join('');
  return { text, html };
}
