// The instant the end-to-end seed calls "today", and the server's clock when it starts
// (tests/e2e/serve.sh sets REELWRIGHT_NOW for both). Every date a spec computes derives from it,
// so the suite passes at any "today" (DEVELOPERS.md, "One clock").
export const SEED_NOW = new Date(process.env.REELWRIGHT_NOW || '2026-12-01T12:00:00Z');

export const DAY = 86_400_000;

/** The zone the month-close and the network's calendar months are counted in. */
const NETWORK_ZONE = 'America/New_York';

/** 'YYYY-MM-DD' of an instant in a zone (en-CA formats dates as ISO). */
export function isoDate(at: Date, timeZone = NETWORK_ZONE): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone }).format(at);
}

/** A calendar date `n` days after an ISO date (negative: before). */
export function addDays(iso: string, n: number): string {
  return new Date(Date.parse(`${iso}T00:00:00Z`) + n * DAY).toISOString().slice(0, 10);
}

/** The seed's "today" in the network's zone. */
export const TODAY = isoDate(SEED_NOW);

/** The calendar month `n` months before the seed's month, as 'YYYY-MM' (1: last month). */
export function monthsBefore(n: number): string {
  const [y, m] = TODAY.split('-').map(Number) as [number, number];
  return new Date(Date.UTC(y, m - 1 - n, 1)).toISOString().slice(0, 7);
}

/** The first and last day of a 'YYYY-MM' month. */
export function monthRange(month: string): { from: string; to: string } {
  const [y, m] = month.split('-').map(Number) as [number, number];
  const last = new Date(Date.UTC(y, m, 0)).toISOString().slice(0, 10);
  return { from: `${month}-01`, to: last };
}

/** How the app names a month: 'November 2026', or short 'Nov 2026'. */
export function monthLabel(month: string, style: 'long' | 'short' = 'long'): string {
  return new Intl.DateTimeFormat('en-US', {
    month: style,
    year: 'numeric',
    timeZone: 'UTC',
  }).format(new Date(`${month}-01T00:00:00Z`));
}

/** The `k`-th Monday-to-Sunday week that starts inside a month (1: the first Monday). */
export function weekIn(month: string, k = 1): { from: string; to: string } {
  const first = new Date(`${month}-01T00:00:00Z`);
  const toMonday = (8 - first.getUTCDay()) % 7; // 0 when the 1st is a Monday
  const from = addDays(`${month}-01`, toMonday + 7 * (k - 1));
  return { from, to: addDays(from, 6) };
}

/** Comeback warranty: a job collected on a day can come back for this many days. */
const WARRANTY_DAYS = 90;

/**
 * The latest calendar quarter whose comeback figures are final: every job collected in it has had
 * its whole warranty window before the seed's "today".
 */
export function closedQuarter(): { from: string; to: string; query: string } {
  const [y, m] = TODAY.split('-').map(Number) as [number, number];
  let q = Math.floor((m - 1) / 3); // the current quarter, 0-based from January
  let year = y;
  for (;;) {
    q -= 1;
    if (q < 0) {
      q = 3;
      year -= 1;
    }
    const from = new Date(Date.UTC(year, q * 3, 1)).toISOString().slice(0, 10);
    const to = new Date(Date.UTC(year, q * 3 + 3, 0)).toISOString().slice(0, 10);
    if (addDays(to, WARRANTY_DAYS) < TODAY) return { from, to, query: `from=${from}&to=${to}` };
  }
}

/** A calendar year after the seed's, for dates a spec means to lie in the future. */
export const NEXT_YEAR = Number(TODAY.slice(0, 4)) + 1;
