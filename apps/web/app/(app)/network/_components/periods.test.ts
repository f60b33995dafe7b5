import { describe, expect, it } from 'vitest';
import {
  formatPeriod,
  kindOf,
  lastCompleteQuarter,
  lastWholeMonth,
  latestFinalQuarter,
  quarterOptions,
  readViewParams,
  seasonPeriod,
  trendWindow,
} from './periods';

const SEASONS = [
  { start: '04-01', end: '11-15' },
  { start: '04-15', end: '10-31' },
];

describe('periods', () => {
  it('the default is the last whole month, across a new year too', () => {
    expect(lastWholeMonth('2026-12-01')).toEqual({
      kind: 'month',
      from: '2026-11-01',
      to: '2026-11-30',
    });
    expect(lastWholeMonth('2027-01-31')).toMatchObject({ from: '2026-12-01', to: '2026-12-31' });
    expect(lastWholeMonth('2028-03-15')).toMatchObject({ from: '2028-02-01', to: '2028-02-29' });
  });

  it('the latest final quarter is the latest whose 90-day warranty windows have all closed', () => {
    expect(lastCompleteQuarter('2026-12-01')).toMatchObject({
      from: '2026-07-01',
      to: '2026-09-30',
    });
    // 30 Sep + 91 days is 30 Dec: Q3 is not final on 1 Dec, Q2 is.
    expect(latestFinalQuarter('2026-12-01', 90)).toMatchObject({
      from: '2026-04-01',
      to: '2026-06-30',
    });
    expect(latestFinalQuarter('2026-12-30', 90)).toMatchObject({
      from: '2026-07-01',
      to: '2026-09-30',
    });
    expect(latestFinalQuarter('2026-02-10', 30)).toMatchObject({
      from: '2025-10-01',
      to: '2025-12-31',
    });
    expect(latestFinalQuarter('2026-01-15', 30)).toMatchObject({
      from: '2025-07-01',
      to: '2025-09-30',
    });
  });

  it('names a pair of dates as the preset it matches', () => {
    expect(kindOf('2026-02-01', '2026-02-28', SEASONS)).toBe('month');
    expect(kindOf('2026-04-01', '2026-06-30', SEASONS)).toBe('quarter');
    expect(seasonPeriod(2026, SEASONS)).toEqual({
      kind: 'season',
      from: '2026-04-01',
      to: '2026-11-15',
    });
    expect(kindOf('2026-04-01', '2026-11-15', SEASONS)).toBe('season');
    expect(kindOf('2026-04-02', '2026-06-30', SEASONS)).toBe('custom');
    expect(quarterOptions('2026-12-01', 2).map((o) => o.label)).toEqual(['Q4 2026', 'Q3 2026']);
  });

  it('reads the address, falling back to the default for a bad period', () => {
    const fallback = { from: '2026-04-01', to: '2026-06-30' };
    expect(
      readViewParams(
        { from: '2026-01-01', to: '2026-01-31', region: '2', units: 'days' },
        fallback,
      ),
    ).toEqual({
      from: '2026-01-01',
      to: '2026-01-31',
      region: 2,
      units: 'days',
      invalid: false,
    });
    expect(readViewParams({ from: '2026-02-30', to: '2026-03-31' }, fallback)).toMatchObject({
      ...fallback,
      invalid: true,
    });
    expect(readViewParams({ from: '2026-03-31', to: '2026-03-01' }, fallback)).toMatchObject({
      invalid: true,
    });
    expect(readViewParams({}, fallback)).toMatchObject({
      ...fallback,
      units: 'hours',
      invalid: false,
    });
  });

  it('formats periods and the twelve-month trend window', () => {
    expect(formatPeriod('2026-08-01', '2026-08-31')).toBe('1–31 Aug 2026');
    expect(formatPeriod('2026-07-01', '2026-09-30')).toBe('1 Jul – 30 Sep 2026');
    expect(formatPeriod('2025-12-01', '2026-01-31')).toBe('1 Dec 2025 – 31 Jan 2026');
    expect(trendWindow({ from: '2026-07-01', to: '2026-09-30' })).toEqual({
      from: '2025-10-01',
      to: '2026-09-30',
    });
    expect(trendWindow({ from: '2024-01-01', to: '2026-09-30' })).toEqual({
      from: '2024-01-01',
      to: '2026-09-30',
    });
  });
});
