import { afterEach, describe, expect, it, vi } from 'vitest';

// server/clock.ts reads REELWRIGHT_NOW once, through env.ts.
async function clockWith(value: string | undefined) {
  vi.resetModules();
  vi.stubEnv('REELWRIGHT_NOW', value ?? '');
  return import('./clock');
}

afterEach(() => {
  vi.unstubAllEnvs();
  vi.resetModules();
});

describe('the app clock', () => {
  it('is the wall clock when REELWRIGHT_NOW is unset', async () => {
    const clock = await clockWith(undefined);
    const before = Date.now();
    const seen = clock.now().getTime();
    expect(seen).toBeGreaterThanOrEqual(before);
    expect(seen).toBeLessThanOrEqual(Date.now());
  });

  it('starts at REELWRIGHT_NOW, a year ahead here, and runs on at the wall clock’s pace', async () => {
    const clock = await clockWith('2027-12-01T12:00:00Z');
    const first = clock.now().getTime();
    expect(first).toBeGreaterThanOrEqual(Date.parse('2027-12-01T12:00:00Z'));
    expect(first).toBeLessThan(Date.parse('2027-12-01T12:00:05Z'));
    await new Promise((r) => setTimeout(r, 30));
    const later = clock.now().getTime();
    expect(later - first).toBeGreaterThanOrEqual(25);
    expect(later - first).toBeLessThan(5_000);
  });

  it('refuses a REELWRIGHT_NOW that is not a real instant', async () => {
    for (const bad of ['2027-02-30T12:00:00Z', '2027-12-01', 'tomorrow']) {
      await expect(clockWith(bad)).rejects.toThrow(/REELWRIGHT_NOW/);
    }
  });
});
