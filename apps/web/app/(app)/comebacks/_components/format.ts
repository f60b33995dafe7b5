import { formatInZone } from '~/lib/format';

export const days = (n: number) => (n === 1 ? '1 day' : `${n} days`);

export const onDate = (iso: string | null, timeZone: string) =>
  iso ? formatInZone(new Date(iso), timeZone, 'd MMM yyyy') : '—';

export const atTime = (iso: string | null, timeZone: string) =>
  iso ? formatInZone(new Date(iso), timeZone, 'EEE d MMM yyyy, HH:mm') : '—';

const money = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
export const formatMoney = (cents: number) => money.format(cents / 100);

/** Whole days from the deadline to now, for a review past it. */
export const daysPast = (dueAt: string, asOf: string) =>
  Math.max(0, Math.floor((Date.parse(asOf) - Date.parse(dueAt)) / 86_400_000));
