import { describe, expect, it } from 'vitest';
import { answering, othersInFlight } from './in-flight';

const later = () => new Promise<void>((resolve) => setTimeout(resolve, 5));

function held() {
  let release!: () => void;
  const promise = new Promise<void>((resolve) => (release = resolve));
  return { promise, release };
}

describe('requests in flight', () => {
  it('counts the requests being answered, not the caller’s own', async () => {
    expect(othersInFlight()).toBe(0);
    const first = held();
    const answered = answering(async () => {
      expect(othersInFlight()).toBe(0);
      await first.promise;
      return 'first';
    });
    const second = answering(async () => {
      await later();
      return othersInFlight();
    });
    expect(othersInFlight()).toBe(2);
    expect(await second).toBe(1);
    first.release();
    expect(await answered).toBe('first');
    expect(othersInFlight()).toBe(0);
  });

  it('stops counting a request when its answer has returned, even if work it started goes on', async () => {
    let background!: Promise<number>;
    const other = held();
    const otherAnswered = answering(() => other.promise);
    await answering(async () => {
      background = later().then(() => othersInFlight());
    });
    // The streamed work runs in the first request's context, which is done: it sees the other.
    expect(await background).toBe(1);
    other.release();
    await otherAnswered;
    expect(othersInFlight()).toBe(0);
  });

  it('counts a request that failed as done', async () => {
    await expect(
      answering(async () => {
        throw new Error('refused');
      }),
    ).rejects.toThrow('refused');
    expect(othersInFlight()).toBe(0);
  });
});
