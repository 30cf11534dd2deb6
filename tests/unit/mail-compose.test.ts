import { describe, expect, it } from 'vitest';
import { composeMail, coveringMessage } from '../../server/services/mail-compose';

const parts = (message: string) => ({
  name: 'Perpetua Langstroth',
  message,
  paragraphs: [{ text: 'Please find attached our quote.' }, { text: 'Read it here:', link: { url: 'https://example.invalid/q/x', label: 'Read it' } }],
  signOff: { from: 'Sam Ashdown', workshop: 'Larkmoor Polishing Rooms', phone: null, email: null },
});

describe('one layout for every e-mail', () => {
  it('takes a typed greeting and sign-off off the covering message', () => {
    expect(coveringMessage('Dear Ann,\n\nThank you.\n\nKind regards,\nBen')).toBe('Thank you.');
    expect(coveringMessage('Hello Mrs Quill!\nWe look forward to it.\nBest wishes\nSam\nLarkmoor')).toBe('We look forward to it.');
    expect(coveringMessage('See you soon.\nWith thanks from us all,\nSam')).toBe('See you soon.');
    expect(coveringMessage('Thank you.')).toBe('Thank you.');
  });

  it('keeps sentences that only begin like a sign-off', () => {
    expect(coveringMessage('Thank you for calling in with the upright.')).toBe('Thank you for calling in with the upright.');
    expect(coveringMessage('Dear me, what a lovely piece.\nThanks to your photos we could price it.')).toBe('Dear me, what a lovely piece.\nThanks to your photos we could price it.');
  });

  it('greeting, message, the product\u2019s paragraphs, then one sign-off', () => {
    for (const message of ['', 'Thank you for calling in.', 'Dear Perpetua,\n\nThank you for calling in.\n\nKind regards,\nSam']) {
      const { text, html } = composeMail(parts(message));
      expect(text.startsWith('Dear Perpetua Langstroth,')).toBe(true);
      expect(text.match(/Dear /g)).toHaveLength(1);
      expect(text.match(/Kind regards/g)).toHaveLength(1);
      expect(text.indexOf('Please find attached')).toBeLessThan(text.indexOf('Kind regards'));
      if (message) expect(text.indexOf('Thank you for calling in.')).toBeLessThan(text.indexOf('Please find attached'));
      expect(text.trimEnd().endsWith('Larkmoor Polishing Rooms')).toBe(true);
      expect(html.indexOf('Dear ')).toBe(3);
      expect(html.lastIndexOf('Kind regards')).toBeGreaterThan(html.indexOf('Read it'));
    }
  });
});
