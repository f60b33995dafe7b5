import { describe, expect, it } from 'vitest';
import { type ComebackRateJob, comebackRate, DEFAULT_COUNTED_ATTRIBUTIONS } from './comebacks';
import { wilsonInterval } from './intervals';

const day = (iso: string): Date => new Date(`${iso}T12:00:00Z`);
const job = (
  collected: string | null,
  comebacks: ComebackRateJob['comebacks'] = [],
): ComebackRateJob => ({
  collectedAt: collected === null ? null : day(collected),
  comebacks,
});
const options = { asOf: day('2025-06-30'), warrantyDays: 90 };

describe('comebackRate', () => {
  it('counts closed windows plus jobs that already came back; counts only chosen attributions', () => {
    const jobs = [
      job('2025-01-10'), // window closed, no comeback
      job('2025-02-01', [{ attribution: 'workmanship', reportedAt: day('2025-02-20') }]),
      job('2025-03-01'), // closed on 30 May
      job('2025-05-01'), // still open: censored
      job('2025-05-20', [{ attribution: 'part_failure', reportedAt: day('2025-06-01') }]), // open but came back
      job('2025-06-01', [{ attribution: 'customer_damage', reportedAt: day('2025-06-10') }]), // came back, not counted
      job(null), // never collected
    ];
    const result = comebackRate(jobs, options);
    expect(result).toMatchObject({ events: 2, trials: 5, rate: 0.4 });
    expect(result.interval).toEqual(wilsonInterval(2, 5));
    expect(DEFAULT_COUNTED_ATTRIBUTIONS).toEqual(['workmanship', 'part_failure']);
  });

  it('lets the owner choose which attributions count', () => {
    const jobs = [
      job('2025-01-10', [{ attribution: 'part_failure', reportedAt: day('2025-01-20') }]),
      job('2025-01-10', [{ attribution: 'undetermined', reportedAt: day('2025-01-25') }]),
    ];
    expect(comebackRate(jobs, { ...options, countedAttributions: ['workmanship'] })).toMatchObject({
      events: 0,
      trials: 2,
    });
    expect(
      comebackRate(jobs, { ...options, countedAttributions: ['workmanship', 'undetermined'] })
        .events,
    ).toBe(1);
  });

  it('counts a job that came back twice once, and ignores comebacks after asOf or the window', () => {
    const jobs = [
      job('2025-01-10', [
        { attribution: 'workmanship', reportedAt: day('2025-01-20') },
        { attribution: 'workmanship', reportedAt: day('2025-02-20') },
      ]),
      job('2025-06-01', [{ attribution: 'workmanship', reportedAt: day('2025-07-05') }]), // after asOf
      job('2025-01-02', [{ attribution: 'workmanship', reportedAt: day('2025-05-01') }]), // after the window
    ];
    expect(comebackRate(jobs, options)).toMatchObject({ events: 1, trials: 2 });
  });

  it('gives null rate and interval when every job is still inside its window, or none are given', () => {
    expect(comebackRate([job('2025-06-01'), job('2025-06-15')], options)).toEqual({
      events: 0,
      trials: 0,
      rate: null,
      interval: null,
    });
    expect(comebackRate([], options).rate).toBeNull();
  });

  it('closes the window exactly warrantyDays × 24 h after collection', () => {
    const collected = [job('2025-04-01')];
    expect(
      comebackRate(collected, { asOf: new Date('2025-06-30T11:59:59Z'), warrantyDays: 90 }).trials,
    ).toBe(0);
    expect(
      comebackRate(collected, { asOf: new Date('2025-06-30T12:00:00Z'), warrantyDays: 90 }).trials,
    ).toBe(1);
  });
});
