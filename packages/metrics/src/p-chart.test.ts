import { describe, expect, it } from 'vitest';
import { pChart, pChartLimits } from './p-chart';

// Montgomery, "Introduction to Statistical Quality Control", orange-juice concentrate cans,
// 30 samples of n = 50 (also NIST/SEMATECH e-Handbook §6.3.3.2).
const defectives = [
  12, 15, 8, 10, 4, 7, 16, 9, 14, 10, 5, 6, 17, 12, 22, 8, 10, 5, 13, 11, 20, 18, 24, 15, 9, 12, 7,
  13, 9, 6,
];

describe('p-chart', () => {
  it('reproduces the orange-juice chart: p̄ = 0.2313, UCL 0.4102, LCL 0.0524 (Montgomery; NIST §6.3.3.2)', () => {
    const chart = pChart(
      defectives.map((d, i) => ({ label: String(i + 1), events: d, trials: 50 })),
    );
    expect(chart.center).toBeCloseTo(0.2313, 4);
    expect(chart.points[0]!.upper).toBeCloseTo(0.4102, 4);
    expect(chart.points[0]!.lower).toBeCloseTo(0.0524, 4);
    const above = chart.points.filter((p) => p.signal === 'above').map((p) => p.label);
    expect(above).toEqual(['15', '23']);
    expect(chart.points.some((p) => p.signal === 'below')).toBe(false);
  });

  it('clamps the lower limit at 0', () => {
    expect(pChartLimits(0.02, 10)).toMatchObject({ center: 0.02, lower: 0 });
    expect(pChartLimits(0.5, 1).upper).toBe(1);
    expect(() => pChartLimits(0.1, 0)).toThrow(RangeError);
    expect(() => pChartLimits(1.1, 10)).toThrow(RangeError);
  });

  it('leaves empty periods without limits', () => {
    const chart = pChart([
      { label: '2025-01', events: 2, trials: 40 },
      { label: '2025-02', events: 0, trials: 0 },
    ]);
    expect(chart.center).toBe(0.05);
    expect(chart.points[1]).toMatchObject({ rate: null, lower: null, upper: null, signal: null });
    expect(pChart([]).center).toBeNull();
  });
});
