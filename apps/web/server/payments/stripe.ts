import Stripe from 'stripe';
import { env } from '~/env';
import { ApiError } from '../errors';

export interface StripeSettings {
  secretKey?: string;
  /** Base URL of a stand-in server (scripts/fake-stripe.mjs), e.g. "http://127.0.0.1:12111". */
  apiBase?: string;
}

/**
 * A Stripe client. With an API base (the local fake) the SDK talks to it over that URL's protocol,
 * host and port; without one, a real secret key talks to Stripe. Retries are off: every call that
 * creates something carries our own idempotency key, and a failed issue is simply issued again.
 */
export function createStripe(settings: StripeSettings): Stripe {
  const key = settings.secretKey ?? (settings.apiBase ? 'sk_test_reelwright_fake' : undefined);
  if (!key) throw paymentsUnavailable();
  if (!settings.apiBase) return new Stripe(key, { maxNetworkRetries: 0, timeout: 20_000 });
  const base = new URL(settings.apiBase);
  const protocol = base.protocol === 'https:' ? 'https' : 'http';
  return new Stripe(key, {
    host: base.hostname,
    port: base.port || (protocol === 'https' ? 443 : 80),
    protocol,
    maxNetworkRetries: 0,
    timeout: 20_000,
  });
}

let shared: Stripe | undefined;

/** The process-wide client from the environment; 503 when payments are not configured. */
export function stripeFromEnv(): Stripe {
  shared ??= createStripe({ secretKey: env.STRIPE_SECRET_KEY, apiBase: env.STRIPE_API_BASE });
  return shared;
}

export function paymentsConfigured(): boolean {
  return Boolean(env.STRIPE_SECRET_KEY || env.STRIPE_API_BASE);
}

export const paymentsUnavailable = () =>
  new ApiError(
    503,
    'payments-unavailable',
    'Payments not configured',
    'Set STRIPE_SECRET_KEY (or STRIPE_API_BASE for the local fake) to issue royalty invoices.',
  );
