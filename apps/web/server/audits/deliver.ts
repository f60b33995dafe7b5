import { after } from 'next/server';
import { deliverMailSoon } from '../queue';

/** Sends queued e-mail once the response has gone; outside a request (tests) it starts at once. */
export function deliverSoon() {
  try {
    after(() => deliverMailSoon());
  } catch {
    void deliverMailSoon();
  }
}
