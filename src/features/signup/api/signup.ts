import { useMutation } from '@tanstack/react-query';
import type { ConfirmEmailInput, SignupInput, SignupResult } from '@shared/schemas/signup';
import { api } from '@/lib/api';

export function signUp(input: SignupInput): Promise<SignupResult> {
  return api<SignupResult>('/api/signup', { method: 'POST', body: input });
}

export function useSignUp() {
  return useMutation({ mutationFn: signUp });
}

export function confirmEmail(input: ConfirmEmailInput): Promise<{ email: string }> {
  return api<{ email: string }>('/api/signup/confirm', { method: 'POST', body: input });
}

export function useConfirmEmail() {
  return useMutation({ mutationFn: confirmEmail });
}
