import { z } from 'zod';

/** The workshop's own account with the payment provider, as the owner's settings page shows it. */
export const CARD_PAYMENT_STATES = ['none', 'onboarding', 'ready'] as const;
export type CardPaymentState = (typeof CARD_PAYMENT_STATES)[number];

export const CARD_PAYMENT_STATE_LABELS: Record<CardPaymentState, string> = {
  none: 'Not connected',
  onboarding: 'Set-up not finished',
  ready: 'Ready: customers can pay by card',
};

export interface CardPayments {
  state: CardPaymentState;
  /** The account's id at the provider (shown so the owner can find it in the provider's dashboard). */
  accountId: string | null;
  /** False when this installation has no payment provider configured at all. */
  configured: boolean;
}

/** Where the provider's set-up page sends the owner back to, and why. */
export const CARD_PAYMENTS_RETURN = 'card-payments';

/**
 * Disconnecting names the account the owner saw: a page opened before another account was connected cannot
 * disconnect the new one.
 */
export const DisconnectCardPaymentsSchema = z
  .object({
    accountId: z
      .string({ message: 'is required: name the account to disconnect' })
      .trim()
      .min(1, { message: 'is required: name the account to disconnect' })
      .max(120, { message: 'must be at most 120 characters' }),
  })
  .strict();
export type DisconnectCardPayments = z.input<typeof DisconnectCardPaymentsSchema>;
