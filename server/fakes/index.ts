/**
 * Starts the local stand-ins for hosted services that the configuration leaves out: the mail catcher when no
 * SMTP_URL is set, the payment provider when no payment keys are set. Production must configure both.
 */
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import type { Config } from '../config';
import { startMailCatcher, type MailCatcher } from './mail-catcher';
import { startPaymentProvider, type PaymentProvider } from './payment-provider';

export interface LocalServices {
  mail?: MailCatcher;
  payments?: PaymentProvider;
  stop(): Promise<void>;
}

/** Where `npm start` keeps the payment stand-in's accounts and checkouts between runs. */
export const paymentStateFile = (config: Config) => path.join(config.dataDir, 'payments', 'state.json');

/**
 * Fills config.mail and config.payments with local stand-ins where they are unset. With `paymentsState`, the payment
 * stand-in keeps what it holds in that file across restarts (`npm start`); the tests give none (each file's own).
 */
export async function startLocalServices(config: Config, opts: { smtpPort?: number; paymentsPort?: number; paymentsState?: string } = {}): Promise<LocalServices> {
  const services: LocalServices = { stop: async () => {} };
  if (!config.mail.url) {
    if (config.env === 'production') throw new Error('SMTP_URL must be set in production');
    services.mail = await startMailCatcher({ port: opts.smtpPort, dir: path.join(config.dataDir, 'mail') });
    config.mail.url = services.mail.url;
  }
  if (!config.payments.secretKey) {
    if (config.env === 'production') throw new Error('PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET must be set in production');
    const apiKey = 'sk_test_shellwright_local';
    const webhookSecret = `whsec_${randomBytes(18).toString('hex')}`;
    services.payments = await startPaymentProvider({
      port: opts.paymentsPort,
      apiKey,
      webhookSecret,
      webhookUrl: `${config.publicUrl}/api/webhooks/payments`,
      stateFile: opts.paymentsState,
    });
    config.payments = { apiUrl: services.payments.url, secretKey: apiKey, webhookSecret };
  }
  services.stop = async () => {
    await Promise.all([services.mail?.stop(), services.payments?.stop()]);
  };
  return services;
}
