import { describe, expect, it } from 'vitest';
import { billedRevenueCents, rateRealisation, revenuePerBenchHour, royaltyCents } from './revenue';

describe('revenue per bench hour', () => {
  it('pools revenue over pooled bench hours', () => {
    // 9000 + 3000 cents over 90 + 30 minutes = 12000 cents over 2 h.
    expect(
      revenuePerBenchHour([
        { revenueCents: 9000, benchMinutes: 90 },
        { revenueCents: 3000, benchMinutes: 30 },
      ]),
    ).toBe(6000);
  });

  it('is null with no bench time', () => {
    expect(revenuePerBenchHour([])).toBeNull();
    expect(revenuePerBenchHour([{ revenueCents: 5000, benchMinutes: 0 }])).toBeNull();
  });

  it('bills labour + parts − discount', () => {
    expect(billedRevenueCents({ labourCents: 4500, partsCents: 1250, discountCents: 500 })).toBe(
      5250,
    );
  });

  it('compares labour per bench hour with the posted rate', () => {
    expect(rateRealisation([{ labourCents: 4500, benchMinutes: 60 }], 6000)).toEqual({
      labourPerBenchHour: 4500,
      realisation: 0.75,
    });
    expect(rateRealisation([], 6000)).toEqual({ labourPerBenchHour: null, realisation: null });
    expect(rateRealisation([{ labourCents: 4500, benchMinutes: 60 }], 0).realisation).toBeNull();
  });
});

describe('royaltyCents', () => {
  it('rounds half to even', () => {
    // 12345 × 600 bp = 740.70 → 741; 125 × 400 bp = 5.00; 1250 × 4 bp = 0.5 → 0; 3750 × 4 bp = 1.5 → 2.
    expect(royaltyCents(12345, 600)).toBe(741);
    expect(royaltyCents(125, 400)).toBe(5);
    expect(royaltyCents(1250, 4)).toBe(0);
    expect(royaltyCents(3750, 4)).toBe(2);
    expect(royaltyCents(6250, 4)).toBe(2);
    expect(royaltyCents(-3750, 4)).toBe(-2);
    expect(royaltyCents(0, 800)).toBe(0);
  });

  it('stays exact for large months', () => {
    expect(royaltyCents(9_007_199_254_740, 750)).toBe(675_539_944_106);
  });

  it('rejects fractional cents and rates', () => {
    expect(() => royaltyCents(10.5, 600)).toThrow(RangeError);
    expect(() => royaltyCents(100, 6.5)).toThrow(RangeError);
    expect(() => royaltyCents(100, -1)).toThrow(RangeError);
  });
});
