import type { UseProfile } from '@reelwright/db/schema';

export interface ServiceReminderInput {
  shopName: string;
  customerName: string;
  reel: string;
  lastServicedOn: string;
  dueOn: string;
  useProfile: UseProfile;
  unsubscribeUrl: string;
  shopPhone?: string | null;
  shopEmail?: string | null;
}

const escapeHtml = (value: string) =>
  value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );

/** "14 March 2027" from a local "YYYY-MM-DD". */
export function longDate(day: string): string {
  const [y, m, d] = day.split('-').map(Number);
  return new Intl.DateTimeFormat('en-GB', {
    day: 'numeric',
    month: 'long',
    year: 'numeric',
    timeZone: 'UTC',
  }).format(new Date(Date.UTC(y!, m! - 1, d!)));
}

/** "1 April" from a season date "MM-DD". */
export function seasonDate(monthDay: string): string {
  const [m, d] = monthDay.split('-').map(Number);
  return new Intl.DateTimeFormat('en-GB', {
    day: 'numeric',
    month: 'long',
    timeZone: 'UTC',
  }).format(new Date(Date.UTC(2001, m! - 1, d!)));
}

/** The pre-season service reminder a consenting customer gets, with its unsubscribe link. */
export function serviceReminderEmail(input: ServiceReminderInput) {
  const advice =
    input.useProfile === 'heavy'
      ? 'Reels that work hard (surf, salt spray, big fish) do best with a service at the start, middle and end of the season.'
      : 'For reels used now and then, a yearly service keeps the drag smooth and the bearings free.';
  const contact = [input.shopPhone, input.shopEmail].filter(Boolean).join(' · ');
  const subject = `Your ${input.reel} is due for a service at ${input.shopName}`;
  const text = [
    `Hello ${input.customerName},`,
    '',
    `Your ${input.reel} was last serviced on ${longDate(input.lastServicedOn)}; its next service is due around ${longDate(input.dueOn)}.`,
    advice,
    '',
    contact
      ? `Bring it in before the season gets busy, or reach the shop at ${contact}.`
      : 'Bring it in before the season gets busy.',
    '',
    `— ${input.shopName}`,
    '',
    `You get these reminders because you asked for them. To stop them: ${input.unsubscribeUrl}`,
  ].join('\n');
  const e = escapeHtml;
  const html = [
    `<p>Hello ${e(input.customerName)},</p>`,
    `<p>Your <strong>${e(input.reel)}</strong> was last serviced on ${e(longDate(input.lastServicedOn))}; its next service is due around <strong>${e(longDate(input.dueOn))}</strong>.</p>`,
    `<p>${e(advice)}</p>`,
    `<p>${contact ? `Bring it in before the season gets busy, or reach the shop at ${e(contact)}.` : 'Bring it in before the season gets busy.'}</p>`,
    `<p>— ${e(input.shopName)}</p>`,
    `<p style="font-size:small;color:#555">You get these reminders because you asked for them. <a href="${e(input.unsubscribeUrl)}">Stop service reminders</a>.</p>`,
  ].join('\n');
  return { subject, text, html };
}
