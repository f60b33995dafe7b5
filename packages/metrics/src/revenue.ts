export interface JobMoney {
  labourCents: number;
  partsCents: number;
  discountCents: number;
}

/** Billed revenue of a job in cents: labour + parts − discount (README, figures table). */
export function billedRevenueCents(job: JobMoney): number {
  return job.labourCents + job.partsCents - job.discountCents;
}

/**
 * Revenue per bench hour in cents per hour: Σ revenue / (Σ bench minutes / 60) over the jobs
 * given (pooled, not an average of per-job ratios). Null with no bench time (empty input or
 * zero hours).
 */
export function revenuePerBenchHour(
  jobs: ReadonlyArray<{ revenueCents: number; benchMinutes: number }>,
): number | null {
  let revenue = 0;
  let minutes = 0;
  for (const job of jobs) {
    revenue += job.revenueCents;
    minutes += job.benchMinutes;
  }
  return minutes > 0 ? (revenue * 60) / minutes : null;
}

export interface RateRealisation {
  /** Labour cents per logged bench hour; null with no bench time. */
  labourPerBenchHour: number | null;
  /** labourPerBenchHour / posted rate (1 = the posted rate earned); null without a rate or hours. */
  realisation: number | null;
}

/**
 * Rate realisation: labour-only revenue per logged bench hour against the shop's posted
 * labour rate (cents per hour). Null parts as for revenuePerBenchHour; a posted rate of 0
 * gives a null realisation.
 */
export function rateRealisation(
  jobs: ReadonlyArray<{ labourCents: number; benchMinutes: number }>,
  postedRateCents: number,
): RateRealisation {
  const labourPerBenchHour = revenuePerBenchHour(
    jobs.map((j) => ({ revenueCents: j.labourCents, benchMinutes: j.benchMinutes })),
  );
  return {
    labourPerBenchHour,
    realisation:
      labourPerBenchHour === null || !(postedRateCents > 0)
        ? null
        : labourPerBenchHour / postedRateCents,
  };
}

/**
 * Royalty due in whole cents: revenue × rate / 10 000 (rate in basis points), rounded half to
 * even (banker's rounding, IEEE 754 roundTiesToEven) so that rounding errors do not build up
 * in one direction over many shops and months. Exact in integer arithmetic (BigInt).
 * Throws RangeError unless both arguments are integers and the rate is ≥ 0.
 */
export function royaltyCents(revenueCents: number, rateBp: number): number {
  if (!Number.isSafeInteger(revenueCents) || !Number.isSafeInteger(rateBp) || rateBp < 0) {
    throw new RangeError(
      'royaltyCents needs integer cents and a non-negative integer rate in basis points',
    );
  }
  const product = BigInt(revenueCents) * BigInt(rateBp);
  const negative = product < 0n;
  const abs = negative ? -product : product;
  let quotient = abs / 10_000n;
  const twiceRemainder = (abs % 10_000n) * 2n;
  if (twiceRemainder > 10_000n || (twiceRemainder === 10_000n && quotient % 2n === 1n))
    quotient += 1n;
  const result = Number(quotient);
  return negative ? -result : result;
}
