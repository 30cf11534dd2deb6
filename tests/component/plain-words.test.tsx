/** Plain words on the staff screens: file sizes, one minus sign, money in the audit log, where each role starts. */
import { screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { ROLES } from '../../shared/schemas/auth';
import { navFor } from '../../src/config/nav';
import { ChangeSummary } from '../../src/features/audit/routes/audit-log';
import { START_HERE, WhereToStart } from '../../src/features/home/components/where-to-start';
import { fileSize } from '../../src/features/pieces/components/photo-gallery';
import { formatMoney } from '../../src/lib/format';
import { renderWithApp } from './render';

afterEach(() => window.localStorage.clear());

describe('plain words', () => {
  it('small photos in KB, large ones in MB', () => {
    expect(fileSize(512)).toBe('512 bytes');
    expect(fileSize(48_300)).toBe('47 KB');
    expect(fileSize(1_048_575)).toBe('1024 KB');
    expect(fileSize(2_516_582)).toBe('2.4 MB');
  });

  it('one minus sign: the typographic one', () => {
    expect(formatMoney('-12.5', 'GBP')).toBe('\u2212£12.50');
    expect(formatMoney('12.5', 'GBP')).toBe('£12.50');
  });

  it('the audit log shows a payment in money, never in minor units or with its session id', () => {
    renderWithApp(<ChangeSummary before={null} after={{ amountMinor: 136382, session: 'cs_test_abc123' }} currency="GBP" />);
    expect(screen.getByText('£1,363.82')).toBeTruthy();
    expect(screen.getByText('amount')).toBeTruthy();
    expect(document.body.textContent).not.toMatch(/amount minor|136382|cs_test/i);
  });

  it('every role is shown where to start, only with pages it may open, until it closes the card', () => {
    for (const role of ROLES) {
      const allowed = new Set(navFor(role).map((n) => n.to));
      for (const step of START_HERE[role]) expect(allowed.has(step.to), `${role}: ${step.to}`).toBe(true);
    }
    const first = renderWithApp(<WhereToStart userId={7} role="workshop" />);
    const card = screen.getByTestId('where-to-start');
    expect(within(card).getAllByRole('link').map((a) => a.textContent)).toEqual(['Planning', 'Forecast']);
    within(card).getByRole('button', { name: 'Close: I know my way' }).click();
    first.unmount();
    renderWithApp(<WhereToStart userId={7} role="workshop" />);
    expect(screen.queryByTestId('where-to-start')).toBeNull();
    expect(screen.getByRole('button', { name: 'Where to start' })).toBeTruthy();
  });
});
