import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';

const integer = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 });

export const formatCount = (n: number) => integer.format(n);

/** An instant shown in the shop's own time zone. */
export function formatInZone(instant: Date, timeZone: string, pattern = 'd MMM yyyy') {
  return format(new TZDate(instant, timeZone), pattern);
}

export function daysBetween(from: Date, to: Date) {
  return Math.max(0, Math.floor((to.getTime() - from.getTime()) / 86_400_000));
}
