import { describe, expect, it } from 'vitest';
import { provisionalPChart } from './trends';

describe('monthly comeback p-chart with open warranty windows', () => {
  const months = [
    { label: '2026-01', events: 2, trials: 100, open: 0 },
    { label: '2026-02', events: 3, trials: 100, open: 0 },
    // Windows still open: only the returns so far are in the trials, so the rate reads high.
    { label: '2026-03', events: 20, trials: 25, open: 75 },
    { label: '2026-04', events: 0, trials: 0, open: 90 },
  ];

  it('takes the centre line from the final months only', () => {
    // p̄ = Σ events ÷ Σ trials over January and February = 5 / 200.
    expect(provisionalPChart(months).center).toBeCloseTo(0.025, 12);
  });

  it('draws a provisional month against its limits but never signals it', () => {
    const march = provisionalPChart(months).points[2]!;
    // The p-chart limits p̄ ± 3·√(p̄(1 − p̄)/n) with n = 25 (Montgomery, Introduction to
    // Statistical Quality Control, ch. 7, the fraction-nonconforming chart; cited from memory):
    // 0.025 + 3·√(0.025·0.975/25) = 0.118675.
    expect(march.upper).toBeCloseTo(0.118675, 5);
    expect(march.lower).toBe(0);
    expect(march).toMatchObject({ rate: 0.8, signal: null, provisional: true, open: 75 });
  });

  it('a final month outside its limits still signals, and an empty month has no rate', () => {
    const points = provisionalPChart([
      ...months.slice(0, 2),
      { label: '2026-03', events: 20, trials: 100, open: 0 },
      months[3]!,
    ]).points;
    expect(points[2]).toMatchObject({ provisional: false, signal: 'above' });
    expect(points[3]).toMatchObject({ rate: null, upper: null, provisional: true });
  });

  it('with every month provisional there is no centre line', () => {
    const chart = provisionalPChart(months.slice(2));
    expect(chart.center).toBeNull();
    expect(chart.points[0]).toMatchObject({ rate: 0.8, upper: null, signal: null });
  });
});
