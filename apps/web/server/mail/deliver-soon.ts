import { after } from 'next/server';
import { deliverPending } from './outbox';

/** Sends queued e-mail once the response has gone; outside a request (tests) it starts at once. */
export function deliverSoon() {
  try {
    after(() => deliverPending());
  } catch {
    void deliverPending();
  }
}
