import { fireEvent, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { MessageTemplateDto } from '../../shared/schemas/messages';
import { MessageTemplatesPage } from '../../src/features/messages/routes/message-templates';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const READY: MessageTemplateDto = {
  kind: 'ready',
  label: 'Ready for collection or delivery',
  when: 'When staff tell the customer the piece is ready.',
  subject: 'Your {piece} is ready',
  body: 'The work on the {piece} is finished.',
  edited: false,
  updatedAt: null,
};

function renderPage(role: 'owner' | 'sales', extra: Record<string, (init?: RequestInit) => Response> = {}) {
  const net = fakeFetch({
    '/api/auth/csrf': () => json({ csrfToken: 't' }),
    '/api/auth/session': () => json({ user: { id: 1, name: 'Sam Ashdown', email: 'sam@example.com', role } }),
    ...extra,
    '/api/messages/settings': () => json({ unansweredAfterDays: 7, expiringBeforeDays: 3 }),
    '/api/messages/templates': () => json([READY]),
  });
  vi.stubGlobal('fetch', net.fn);
  renderWithApp(<MessageTemplatesPage />);
  return net;
}

describe('the message templates page', () => {
  it('names an unknown placeholder on the message before sending anything, and previews what the customer reads', async () => {
    const net = renderPage('owner', {
      '/api/messages/templates/ready/preview': () => json({ subject: 'Your Walnut writing bureau is ready', text: 'Dear Mrs Ada Fenwick,\n\nThe work on the Walnut writing bureau is finished.' }),
    });
    const card = (await screen.findByText('Ready for collection or delivery')).closest('section, div')!.parentElement!;
    const body = within(card).getByLabelText('Message');
    fireEvent.change(body, { target: { value: 'Your {piano} is ready.' } });
    fireEvent.click(within(card).getByRole('button', { name: 'Save' }));
    expect(await within(card).findByText(/\{piano\}/, { selector: 'p' })).toBeTruthy();
    expect(net.calls.filter((c) => c.init?.method === 'PUT')).toHaveLength(0);

    fireEvent.change(body, { target: { value: 'The work on the {piece} is finished.' } });
    fireEvent.click(within(card).getByRole('button', { name: 'Preview' }));
    expect(await screen.findByText('Your Walnut writing bureau is ready')).toBeTruthy();
  });

  it('lets sales read the templates but not change them', async () => {
    renderPage('sales');
    await screen.findByText('Ready for collection or delivery');
    expect((screen.getByLabelText('Message') as HTMLTextAreaElement).disabled).toBe(true);
    expect(screen.queryByRole('button', { name: 'Save' })).toBeNull();
  });
});
