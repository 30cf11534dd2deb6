/**
 * Asks for a new confirmation link for an address that signed up but has not confirmed it yet. The sign-in page
 * (an unconfirmed address is refused there) and the sign-up pages both offer it. The answer is the same whatever
 * the address.
 */
import { useMutation } from '@tanstack/react-query';
import type { ResendConfirmationInput } from '@shared/schemas/signup';
import { api } from './api';

export function resendConfirmation(input: ResendConfirmationInput): Promise<{ message: string }> {
  return api<{ message: string }>('/api/signup/resend', { method: 'POST', body: input });
}

export function useResendConfirmation() {
  return useMutation({ mutationFn: resendConfirmation });
}
