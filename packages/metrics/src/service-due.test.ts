import { describe, expect, it } from 'vitest';
import { nextServiceDue, serviceReminders } from './service-due';

const season = { start: '04-01', end: '10-31' };

// Intervals are common practice (about yearly for light use; start, middle and end of the
// season for heavy use), not a published source.
describe('nextServiceDue (common practice)', () => {
  it('is a year after the last service for light use', () => {
    expect(nextServiceDue('2025-03-12', 'light', season)).toBe('2026-03-12');
    expect(nextServiceDue('2024-02-29', 'light', season)).toBe('2025-02-28');
  });

  it('is the next of season start, middle and end for heavy use', () => {
    // 1 April → 31 October: 213 days, middle 16 July.
    expect(nextServiceDue('2025-02-10', 'heavy', season)).toBe('2025-04-01');
    expect(nextServiceDue('2025-04-01', 'heavy', season)).toBe('2025-07-16');
    expect(nextServiceDue('2025-08-02', 'heavy', season)).toBe('2025-10-31');
    expect(nextServiceDue('2025-11-15', 'heavy', season)).toBe('2026-04-01');
  });

  it('handles a season over the new year', () => {
    const southern = { start: '10-01', end: '03-31' };
    expect(nextServiceDue('2025-12-01', 'heavy', southern)).toBe('2025-12-30');
    expect(nextServiceDue('2026-01-05', 'heavy', southern)).toBe('2026-03-31');
    expect(nextServiceDue('2026-04-10', 'heavy', southern)).toBe('2026-10-01');
  });

  it('rejects malformed dates', () => {
    expect(() => nextServiceDue('2025-13-01', 'light', season)).toThrow(RangeError);
    expect(() => nextServiceDue('2025-03-01', 'heavy', { start: '4/1', end: '10-31' })).toThrow(
      RangeError,
    );
  });
});

describe('serviceReminders', () => {
  it('lists consenting owners whose reel falls due within the horizon, earliest first', () => {
    const reels = [
      { id: 'r1', lastServiceOn: '2025-03-20', profile: 'light' as const, reminderConsent: true },
      { id: 'r2', lastServiceOn: '2025-11-01', profile: 'heavy' as const, reminderConsent: true },
      { id: 'r3', lastServiceOn: '2025-11-01', profile: 'heavy' as const, reminderConsent: false },
      { id: 'r4', lastServiceOn: '2025-09-01', profile: 'light' as const, reminderConsent: true },
      { id: 'r5', lastServiceOn: '2024-01-15', profile: 'light' as const, reminderConsent: true },
    ];
    const due = serviceReminders(reels, { asOf: '2026-03-01', withinDays: 45, season });
    expect(due.map((r) => [r.id, r.dueOn])).toEqual([
      ['r5', '2025-01-15'],
      ['r1', '2026-03-20'],
      ['r2', '2026-04-01'],
    ]);
    expect(serviceReminders([], { asOf: '2026-03-01', withinDays: 45, season })).toEqual([]);
  });
});
