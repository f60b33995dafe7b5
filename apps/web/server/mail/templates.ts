import type { OpeningHours, Weekday } from '@reelwright/db/schema';

export interface RenderedEmail {
  subject: string;
  text: string;
  html: string;
}

export interface ReadyForPickupInput {
  shopName: string;
  customerName: string;
  /** The reel as the customer knows it, e.g. "Tidewake Seaspin 4000". */
  reel: string;
  jobId: number;
  openingHours: OpeningHours;
  shopPhone?: string | null;
  shopEmail?: string | null;
}

const DAYS: { key: Weekday; label: string }[] = [
  { key: 'mon', label: 'Mon' },
  { key: 'tue', label: 'Tue' },
  { key: 'wed', label: 'Wed' },
  { key: 'thu', label: 'Thu' },
  { key: 'fri', label: 'Fri' },
  { key: 'sat', label: 'Sat' },
  { key: 'sun', label: 'Sun' },
];

/** "Mon–Fri 09:00–17:30, Sat 09:00–13:00; closed Sun": neighbouring days with the same hours merged. */
export function openingHoursHint(hours: OpeningHours): string {
  const spanText = (day: Weekday) =>
    (hours[day] ?? []).map((s) => `${s.open}–${s.close}`).join(' and ');
  const groups: { from: string; to: string; text: string }[] = [];
  const closed: string[] = [];
  for (const { key, label } of DAYS) {
    const text = spanText(key);
    if (!text) {
      closed.push(label);
      continue;
    }
    const last = groups.at(-1);
    const previousDay = DAYS[DAYS.findIndex((d) => d.key === key) - 1]?.label;
    if (last && last.text === text && last.to === previousDay) last.to = label;
    else groups.push({ from: label, to: label, text });
  }
  if (!groups.length) return 'Please call the shop for opening hours.';
  const open = groups
    .map((g) => `${g.from === g.to ? g.from : `${g.from}–${g.to}`} ${g.text}`)
    .join(', ');
  return closed.length ? `${open}; closed ${closed.join(', ')}` : open;
}

const escapeHtml = (value: string) =>
  value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  );

/** The message a customer gets when their reel is ready for pickup. */
export function readyForPickupEmail(input: ReadyForPickupInput): RenderedEmail {
  const jobNumber = `#${input.jobId}`;
  const hours = openingHoursHint(input.openingHours);
  const contact = [input.shopPhone, input.shopEmail].filter(Boolean).join(' · ');
  const subject = `Your ${input.reel} is ready for pickup at ${input.shopName}`;
  const lines = [
    `Hello ${input.customerName},`,
    '',
    `Good news: your ${input.reel} (job ${jobNumber}) has been serviced and is ready for pickup at ${input.shopName}.`,
    '',
    `Opening hours: ${hours}.`,
    'Please bring this job number with you.',
    ...(contact ? ['', `Questions? Reach the shop at ${contact}.`] : []),
    '',
    `— ${input.shopName}`,
  ];
  const e = escapeHtml;
  const html = [
    `<p>Hello ${e(input.customerName)},</p>`,
    `<p>Good news: your <strong>${e(input.reel)}</strong> (job ${e(jobNumber)}) has been serviced and is ready for pickup at ${e(input.shopName)}.</p>`,
    `<p>Opening hours: ${e(hours)}.<br>Please bring this job number with you.</p>`,
    contact ? `<p>Questions? Reach the shop at ${e(contact)}.</p>` : '',
    `<p>— ${e(input.shopName)}</p>`,
  ]
    .filter(Boolean)
    .join('\n');
  return { subject, text: lines.join('\n'), html };
}
