import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { businessMinutes, type ShopCalendar } from './business-time';
import { jobTurnaround, onTimeShare, turnaroundSummary } from './turnaround';

const day = [{ open: '09:00', close: '17:00' }];
const cal: ShopCalendar = {
  timeZone: 'America/Chicago',
  weekly: { mon: day, tue: day, wed: day, thu: day, fri: day },
  closedDates: [],
};
const at = (iso: string): Date => new Date(iso);

describe('jobTurnaround', () => {
  it('subtracts clipped, merged waiting-on-parts spells from customer turnaround', () => {
    const result = jobTurnaround(
      {
        checkedInAt: at('2024-07-01T09:00:00-05:00'),
        readyAt: at('2024-07-03T17:00:00-05:00'),
        waitingSpans: [
          // Began before check-in: only Monday 09–10 counts.
          { from: at('2024-06-30T12:00:00-05:00'), to: at('2024-07-01T10:00:00-05:00') },
          // Two overlapping spells: Monday 16–17 and Tuesday 09–11, counted once.
          { from: at('2024-07-01T16:00:00-05:00'), to: at('2024-07-02T10:00:00-05:00') },
          { from: at('2024-07-02T09:30:00-05:00'), to: at('2024-07-02T11:00:00-05:00') },
          // Still open: clipped at ready.
          { from: at('2024-07-03T16:30:00-05:00'), to: null },
        ],
      },
      cal,
    );
    expect(result).toEqual({ customerMinutes: 1440, waitingMinutes: 270, benchMinutes: 1170 });
  });

  it('gives equal customer and bench turnaround without waiting, and zeros when ready first', () => {
    const job = {
      checkedInAt: at('2024-07-05T16:00:00-05:00'),
      readyAt: at('2024-07-08T10:00:00-05:00'),
      waitingSpans: [],
    };
    expect(jobTurnaround(job, cal)).toEqual({
      customerMinutes: 120,
      benchMinutes: 120,
      waitingMinutes: 0,
    });
    expect(
      jobTurnaround(
        {
          checkedInAt: job.readyAt,
          readyAt: job.checkedInAt,
          waitingSpans: [{ from: job.checkedInAt, to: null }],
        },
        cal,
      ),
    ).toEqual({ customerMinutes: 0, benchMinutes: 0, waitingMinutes: 0 });
  });
});

describe('turnaroundSummary', () => {
  it('reports count, median and type 7 p90', () => {
    // Type 7 on 1..10: median 5.5, p90 = x[8.1] = 9.1.
    expect(turnaroundSummary([10, 9, 8, 7, 6, 5, 4, 3, 2, 1])).toEqual({
      count: 10,
      median: 5.5,
      p90: 9.1,
    });
  });

  it('gives nulls on empty input', () => {
    expect(turnaroundSummary([])).toEqual({ count: 0, median: null, p90: null });
  });
});

describe('onTimeShare', () => {
  it('counts ready at or before promised, skipping jobs without both times', () => {
    const promised = at('2024-07-03T17:00:00Z');
    expect(
      onTimeShare([
        { readyAt: at('2024-07-03T17:00:00Z'), promisedAt: promised },
        { readyAt: at('2024-07-03T16:00:00Z'), promisedAt: promised },
        { readyAt: at('2024-07-03T17:01:00Z'), promisedAt: promised },
        { readyAt: null, promisedAt: promised },
        { readyAt: promised, promisedAt: null },
      ]),
    ).toEqual({ onTime: 2, total: 3, share: 2 / 3 });
    expect(onTimeShare([])).toEqual({ onTime: 0, total: 0, share: null });
  });
});

describe('jobTurnaround on random spells', () => {
  it('splits customer turnaround into bench and waiting, each within bounds', () => {
    const hours = (h: number): Date => new Date(Date.UTC(2024, 2, 4, 12) + h * 3_600_000);
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 400 }),
        fc.integer({ min: 0, max: 400 }),
        fc.array(
          fc.tuple(
            fc.integer({ min: -50, max: 450 }),
            fc.integer({ min: 0, max: 200 }),
            fc.boolean(),
          ),
          {
            maxLength: 5,
          },
        ),
        (checkIn, length, spells) => {
          const result = jobTurnaround(
            {
              checkedInAt: hours(checkIn),
              readyAt: hours(checkIn + length),
              waitingSpans: spells.map(([from, span, open]) => ({
                from: hours(from),
                to: open ? null : hours(from + span),
              })),
            },
            cal,
          );
          expect(result.customerMinutes).toBe(
            businessMinutes(hours(checkIn), hours(checkIn + length), cal),
          );
          expect(result.waitingMinutes).toBeGreaterThanOrEqual(0);
          expect(result.benchMinutes).toBeGreaterThanOrEqual(0);
          expect(result.benchMinutes + result.waitingMinutes).toBeCloseTo(
            result.customerMinutes,
            9,
          );
        },
      ),
      { numRuns: 300 },
    );
  });
});
