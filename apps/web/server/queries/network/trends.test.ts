import { comebackEstimate, comebackReference, type SurvivalTable } from '@reelwright/metrics';
import { describe, expect, it } from 'vitest';
import { comebackTrendPoints } from './trends';

const W = 90;

/** A follow-up table over days 0…W with the given events and censorings by day. */
function table(events: Record<number, number>, censored: Record<number, number>): SurvivalTable {
  const time = Array.from({ length: W + 1 }, (_, i) => i);
  return {
    time,
    events: time.map((t) => events[t] ?? 0),
    censored: time.map((t) => censored[t] ?? 0),
  };
}

// A network reference: 1,000 jobs followed through the window, 50 back on day 10.
const reference = comebackReference(table({ 10: 50 }, { [W]: 950 }), W)!;
const month = (label: string, t: SurvivalTable) => ({
  label,
  estimate: comebackEstimate(t, { warrantyDays: W, reference }),
});

describe('monthly comeback trend: final months and estimates', () => {
  const months = [
    // Every window closed: 2 of 100 and 3 of 100 came back.
    month('2026-01', table({ 5: 2 }, { [W]: 98 })),
    month('2026-02', table({ 30: 3 }, { [W]: 97 })),
    // Windows open: 40 followed through, 60 still followed at day 50, 4 back so far.
    month('2026-03', table({ 8: 4 }, { 50: 60, [W]: 36 })),
    // Nobody followed through yet: 80 jobs at day 20, 3 back on day 5.
    month('2026-04', table({ 5: 3 }, { 20: 77 })),
    month('2026-05', table({}, {})),
  ];
  const chart = comebackTrendPoints(months);

  it('takes the centre line from the final months only', () => {
    // p̄ = Σ events ÷ Σ jobs over January and February = 5 / 200.
    expect(chart.center).toBeCloseTo(0.025, 12);
  });

  it('a final month has its rate, its interval and its p-chart limits', () => {
    const january = chart.points[0]!;
    expect(january).toMatchObject({
      label: '2026-01',
      events: 2,
      trials: 100,
      stillFollowed: 0,
      // The two back on day 5 ended their follow-up there.
      followedThrough: 98,
      provisional: false,
      method: 'kaplan-meier',
      signal: null,
    });
    expect(january.rate).toBeCloseTo(0.02, 12);
    // The p-chart limits p̄ ± 3·√(p̄(1 − p̄)/n) with n = 100 (Montgomery, Introduction to
    // Statistical Quality Control, ch. 7, the fraction-nonconforming chart; cited from memory):
    // 0.025 + 3·√(0.025·0.975/100) = 0.071837.
    expect(january.upper).toBeCloseTo(0.071837, 5);
    expect(january.lower).toBe(0);
    // The interval is the estimate's own, around the rate.
    expect(january.interval!.lower).toBeLessThan(0.02);
    expect(january.interval!.upper).toBeGreaterThan(0.02);
  });

  it('a month with jobs still followed shows its Kaplan–Meier estimate, with no limits and never a signal', () => {
    const march = chart.points[2]!;
    // Kaplan–Meier: 4 events among 100 at risk on day 8, nothing after: 1 − 96/100.
    expect(march.rate).toBeCloseTo(0.04, 12);
    expect(march).toMatchObject({
      method: 'kaplan-meier',
      provisional: true,
      stillFollowed: 60,
      followedThrough: 36,
      lower: null,
      upper: null,
      signal: null,
    });
    expect(march.interval!.upper).toBeGreaterThan(0.04);
  });

  it('a month nobody has been followed through is the network curve carried by its ratio', () => {
    const april = chart.points[3]!;
    expect(april.method).toBe('network × ratio');
    expect(april.provisional).toBe(true);
    // E = Σ Λ at each job's follow-up: 77 jobs past day 10 × 50/1000 = 3.85 (the three back on
    // day 5 had not reached it); O = 3; the network's 90-day probability is 0.05, so the
    // estimate is 3/3.85 × 0.05.
    expect(april.rate).toBeCloseTo((3 / 3.85) * 0.05, 12);
    expect(april.interval!.lower).toBeLessThan(april.rate!);
    expect(april.interval!.upper).toBeGreaterThan(april.rate!);
    expect(april.signal).toBeNull();
  });

  it('a month with no jobs has no rate and is not final', () => {
    expect(chart.points[4]).toMatchObject({
      rate: null,
      interval: null,
      trials: 0,
      provisional: true,
      method: null,
    });
  });

  it('a final month outside its limits signals; an estimate far above them does not', () => {
    const points = comebackTrendPoints([
      ...months.slice(0, 2),
      month('2026-03', table({ 5: 20 }, { [W]: 80 })),
      month('2026-04', table({ 5: 30 }, { 20: 50 })),
    ]).points;
    expect(points[2]).toMatchObject({ provisional: false, signal: 'above' });
    expect(points[3]!.rate!).toBeGreaterThan(0.2);
    expect(points[3]).toMatchObject({ provisional: true, signal: null, upper: null });
  });

  it('with no final month there is no centre line, and the estimates are still shown', () => {
    const only = comebackTrendPoints(months.slice(2));
    expect(only.center).toBeNull();
    expect(only.points[0]!.rate).toBeCloseTo(0.04, 12);
  });
});
