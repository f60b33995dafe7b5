import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import * as metrics from './index';

describe('@reelwright/metrics public API', () => {
  it('exports the functions issue 3 names', () => {
    for (const name of [
      'businessMinutes',
      'businessDays',
      'quantile',
      'wilsonInterval',
      'clopperPearsonInterval',
      'funnelLimits',
      'pChartLimits',
      'fairnessBand',
      'sampleSizeCodeLetter',
      'singleSamplingPlan',
      'nextSeverity',
      'drawSample',
      'scoreAudit',
      'revenuePerBenchHour',
      'nextServiceDue',
      'jobTurnaround',
      'turnaroundSummary',
      'onTimeShare',
      'comebackRate',
      'compareShops',
      'royaltyCents',
      'followUp',
      'followUpTable',
      'kaplanMeier',
      'eventProbability',
      'nelsonAalen',
      'hazardAt',
      'expectedEvents',
      'poissonInterval',
      'standardizedRatio',
      'ratioFunnelLimits',
      'ratioBand',
      'compareRatios',
      'comebackReference',
      'comebackEstimate',
      'expectedRate',
    ]) {
      expect(typeof (metrics as Record<string, unknown>)[name], name).toBe('function');
    }
  });

  it('reads no clock and imports no database or framework', () => {
    const files = readdirSync(__dirname, { recursive: true, encoding: 'utf8' }).filter(
      (f) => f.endsWith('.ts') && !f.endsWith('.test.ts'),
    );
    expect(files.length).toBeGreaterThan(10);
    for (const file of files) {
      const source = readFileSync(join(__dirname, file), 'utf8');
      expect(source, file).not.toMatch(/Date\.now\(|new Date\(\)|performance\.now\(/);
      expect(source, file).not.toMatch(/from ['"](@reelwright\/db|drizzle-orm|next|react)/);
    }
  });
});
