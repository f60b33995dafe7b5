import { describe, expect, it } from 'vitest';
import { scoreAudit } from './audit-score';

const form = [
  { id: 'teardown-photos', weight: 10, critical: false },
  { id: 'drag-stack-greased', weight: 30, critical: true },
  { id: 'bearings-checked', weight: 20, critical: false },
  { id: 'test-crank', weight: 40, critical: false },
];

describe('scoreAudit', () => {
  it('scores passed weight over applicable weight', () => {
    const result = scoreAudit(form, {
      'teardown-photos': 'fail',
      'drag-stack-greased': 'pass',
      'bearings-checked': 'n/a',
      'test-crank': 'pass',
    });
    // (30 + 40) / (10 + 30 + 40)
    expect(result.score).toBeCloseTo(87.5, 12);
    expect(result.verdict).toBe('meets standard');
  });

  it('makes any failed critical item a critical miss whatever the score', () => {
    const result = scoreAudit([...form, { id: 'extra', weight: 1000, critical: false }], {
      'drag-stack-greased': 'fail',
      'teardown-photos': 'pass',
      'bearings-checked': 'pass',
      'test-crank': 'pass',
      extra: 'pass',
    });
    expect(result.score).toBeGreaterThan(97);
    expect(result.verdict).toBe('critical miss');
    expect(result.criticalFailures).toEqual(['drag-stack-greased']);
  });

  it('uses the pass mark, 85 by default, inclusive', () => {
    const items = [
      { id: 'a', weight: 17, critical: false },
      { id: 'b', weight: 3, critical: false },
    ];
    expect(scoreAudit(items, { a: 'pass', b: 'fail' })).toMatchObject({
      score: 85,
      verdict: 'meets standard',
    });
    expect(scoreAudit(items, { a: 'pass', b: 'fail' }, 90).verdict).toBe('needs work');
  });

  it('scores 100 with nothing applicable and lists unanswered items', () => {
    expect(scoreAudit([], {})).toMatchObject({ score: 100, verdict: 'meets standard' });
    const result = scoreAudit(form, { 'test-crank': 'pass' });
    expect(result.score).toBe(100);
    expect(result.unanswered).toEqual([
      'teardown-photos',
      'drag-stack-greased',
      'bearings-checked',
    ]);
  });

  it('rejects negative weights and a pass mark outside 0–100', () => {
    expect(() => scoreAudit([{ id: 'x', weight: -1, critical: false }], { x: 'pass' })).toThrow(
      RangeError,
    );
    expect(() => scoreAudit(form, {}, 120)).toThrow(RangeError);
  });
});
