import type { RoyaltyInvoiceStatus } from '@reelwright/db/schema';

export const DASH = '—';

const moneyFormats = new Map<string, Intl.NumberFormat>();
export function money(cents: number | null | undefined, currency = 'USD') {
  if (cents == null) return DASH;
  let f = moneyFormats.get(currency);
  if (!f)
    moneyFormats.set(
      currency,
      (f = new Intl.NumberFormat('en-US', { style: 'currency', currency })),
    );
  return f.format(cents / 100);
}

const count = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 });
export const n = (value: number) => count.format(value);

/** Business minutes as hours, one decimal. */
export const hours = (minutes: number | null | undefined) =>
  minutes == null ? DASH : `${(minutes / 60).toFixed(1)} h`;

export const percent = (share: number | null | undefined, digits = 1) =>
  share == null ? DASH : `${(share * 100).toFixed(digits)}%`;

export const rateBp = (bp: number | null) => (bp == null ? DASH : `${(bp / 100).toFixed(2)}%`);

const instant = new Intl.DateTimeFormat('en-US', {
  day: 'numeric',
  month: 'short',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
  hourCycle: 'h23',
  timeZone: 'UTC',
});
/** An instant for the whole network (shops sit in several zones): shown in UTC, and says so. */
export const utc = (iso: string | null | undefined) =>
  iso ? `${instant.format(new Date(iso))} UTC` : DASH;

export const INVOICE_LABELS: Record<RoyaltyInvoiceStatus | 'none', string> = {
  none: 'Not issued',
  pending: 'Not sent yet',
  open: 'Sent, unpaid',
  paid: 'Paid',
  failed: 'Payment failed',
  void: 'Void',
};

export const INVOICE_STYLES: Record<RoyaltyInvoiceStatus | 'none', string> = {
  none: 'bg-white text-slate-700 ring-slate-300',
  pending: 'bg-sand-100 text-slate-800 ring-sand-300',
  open: 'bg-brass-50 text-brass-800 ring-brass-200',
  paid: 'bg-sea-700 text-white ring-sea-700',
  failed: 'bg-brick-50 text-brick-800 ring-brick-300',
  void: 'bg-slate-100 text-slate-700 ring-slate-300',
};
