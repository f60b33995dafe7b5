import { type Interval } from './intervals';
import { normalQuantile } from './normal';

const DAY = 86_400_000;

/** One collected job: when it was collected and, if any, its first counted comeback. */
export interface FollowUpRow {
  collectedAt: Date;
  /** The first comeback with a counted attribution (null when none). */
  comebackAt: Date | null;
}

/** A job's follow-up: whole days since collection, and whether it ended in a counted comeback. */
export interface FollowUp {
  time: number;
  event: boolean;
}

/**
 * Survival data grouped by time: distinct times ascending, with the events and the censored
 * observations at each (censored at t are still at risk at t, as Kaplan and Meier take them).
 * Tables of the same times can be added; the app may build one straight from grouped counts.
 */
export interface SurvivalTable {
  time: number[];
  events: number[];
  censored: number[];
}

function checkWarranty(warrantyDays: number): void {
  if (!Number.isInteger(warrantyDays) || warrantyDays < 1) {
    throw new RangeError(`warrantyDays must be a positive integer, got ${warrantyDays}`);
  }
}

/**
 * A collected job's follow-up in whole days (of 24 h) since collection, over the warranty window
 * [collectedAt, collectedAt + W × 24 h) as in `comebackRate`. The job has been watched for
 * f = min(W, ⌊(asOf − collectedAt) / 24 h⌋) whole days. A counted comeback at x days
 * (0 ≤ x < W, reported by asOf) on day d = ⌊x⌋ is an event at time d + 1 ("within d + 1
 * days") when d < f; otherwise the job is censored at f. A comeback on the day still in
 * progress counts once that day is complete (at most 24 h later): each day's risk set then
 * holds only jobs watched for that whole day, and counting it at once would bias the estimate
 * upward. Whole days rather than fractions so that the app can group jobs by day and get the
 * same table, and the network curve has at most W steps.
 *
 * Returns null for a job collected after asOf. A comeback before collection, at or after the
 * window's end, or after asOf is ignored (the job is followed as if it had none).
 */
export function followUp(
  row: FollowUpRow,
  options: { asOf: Date; warrantyDays: number },
): FollowUp | null {
  checkWarranty(options.warrantyDays);
  return followUpMs(
    row.collectedAt.getTime(),
    row.comebackAt?.getTime() ?? null,
    options.asOf.getTime(),
    options.warrantyDays,
  );
}

function followUpMs(
  collected: number,
  comeback: number | null,
  asOf: number,
  warrantyDays: number,
): FollowUp | null {
  if (collected > asOf) return null;
  const watched = Math.min(warrantyDays, Math.floor((asOf - collected) / DAY));
  if (comeback !== null && comeback >= collected && comeback <= asOf) {
    const day = Math.floor((comeback - collected) / DAY);
    if (day < watched) return { time: day + 1, event: true };
  }
  return { time: watched, event: false };
}

/**
 * The survival table of the jobs' follow-up (`followUp` for each row), with one entry per whole
 * day 0…W whether or not anything happened on it. Jobs collected after asOf are left out.
 */
export function followUpTable(
  rows: Iterable<FollowUpRow>,
  options: { asOf: Date; warrantyDays: number },
): SurvivalTable {
  const w = options.warrantyDays;
  checkWarranty(w);
  const asOf = options.asOf.getTime();
  const events = new Array<number>(w + 1).fill(0);
  const censored = new Array<number>(w + 1).fill(0);
  for (const row of rows) {
    const f = followUpMs(row.collectedAt.getTime(), row.comebackAt?.getTime() ?? null, asOf, w);
    if (f === null) continue;
    if (f.event) events[f.time]!++;
    else censored[f.time]!++;
  }
  return { time: Array.from({ length: w + 1 }, (_, i) => i), events, censored };
}

/** Groups (time, event) pairs into a survival table. Throws RangeError on a negative or NaN time. */
export function survivalTable(pairs: Iterable<FollowUp>): SurvivalTable {
  const byTime = new Map<number, [number, number]>();
  for (const p of pairs) {
    if (!(p.time >= 0)) throw new RangeError(`time must be non-negative, got ${p.time}`);
    const cell = byTime.get(p.time) ?? [0, 0];
    cell[p.event ? 0 : 1]++;
    byTime.set(p.time, cell);
  }
  const time = [...byTime.keys()].sort((a, b) => a - b);
  return {
    time,
    events: time.map((t) => byTime.get(t)![0]),
    censored: time.map((t) => byTime.get(t)![1]),
  };
}

/** Adds survival tables (for instance shops into the network, or months into a quarter). */
export function mergeSurvivalTables(tables: readonly SurvivalTable[]): SurvivalTable {
  const byTime = new Map<number, [number, number]>();
  for (const t of tables) {
    t.time.forEach((time, i) => {
      const cell = byTime.get(time) ?? [0, 0];
      cell[0] += t.events[i] ?? 0;
      cell[1] += t.censored[i] ?? 0;
      byTime.set(time, cell);
    });
  }
  const time = [...byTime.keys()].sort((a, b) => a - b);
  return {
    time,
    events: time.map((t) => byTime.get(t)![0]),
    censored: time.map((t) => byTime.get(t)![1]),
  };
}

/** Totals of a table: jobs, events, and those censored before `horizon` (still being followed). */
export function tableTotals(
  table: SurvivalTable,
  horizon = Infinity,
): { jobs: number; events: number; censoredBefore: number; followedThrough: number } {
  let events = 0;
  let censored = 0;
  let censoredBefore = 0;
  let followedThrough = 0;
  table.time.forEach((t, i) => {
    const e = table.events[i] ?? 0;
    const c = table.censored[i] ?? 0;
    events += e;
    censored += c;
    if (t < horizon) censoredBefore += c;
    if (t >= horizon) followedThrough += e + c;
  });
  return { jobs: events + censored, events, censoredBefore, followedThrough };
}

/** Kaplan–Meier curve at every distinct time of its table (steps only where events > 0). */
export interface KaplanMeierCurve {
  /** Jobs (observations) in all. */
  n: number;
  time: number[];
  atRisk: number[];
  events: number[];
  censored: number[];
  /** Ŝ(t) just after each time. */
  survival: number[];
  /** Greenwood's running sum Σ d/(n(n − d)) up to each time; Infinity once Ŝ has reached 0. */
  greenwood: number[];
}

/** Index of the first entry ≥ t in an ascending array (its length when there is none). */
function firstAtLeast(times: readonly number[], t: number): number {
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times[mid]! < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Index of the last entry ≤ t in an ascending array, −1 when there is none (binary search). */
function lastAtOrBefore(times: readonly number[], t: number): number {
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (times[mid]! <= t) lo = mid + 1;
    else hi = mid;
  }
  return lo - 1;
}

function checkTable(table: SurvivalTable): void {
  const { time, events, censored } = table;
  if (events.length !== time.length || censored.length !== time.length) {
    throw new RangeError('time, events and censored must have the same length');
  }
  for (let i = 0; i < time.length; i++) {
    if (!(time[i]! >= 0) || (i > 0 && !(time[i]! > time[i - 1]!))) {
      throw new RangeError('times must be non-negative and strictly ascending');
    }
    for (const c of [events[i]!, censored[i]!]) {
      if (!Number.isInteger(c) || c < 0) throw new RangeError(`counts must be integers ≥ 0`);
    }
  }
}

/**
 * Kaplan–Meier product-limit estimate: Kaplan & Meier (1958) "Nonparametric estimation from
 * incomplete observations", JASA 53:457–481. Ŝ(t) = Π over times tⱼ ≤ t of (1 − dⱼ/nⱼ), nⱼ the
 * observations with time ≥ tⱼ (censored at tⱼ are at risk at tⱼ). Greenwood's (1926) variance
 * Var Ŝ(t) = Ŝ(t)² Σ dⱼ/(nⱼ(nⱼ − dⱼ)); the running sum is kept (Infinity once Ŝ reaches 0).
 * An empty table gives an empty curve.
 */
export function kaplanMeier(table: SurvivalTable): KaplanMeierCurve {
  checkTable(table);
  let n = 0;
  for (let i = 0; i < table.time.length; i++) n += table.events[i]! + table.censored[i]!;
  const curve: KaplanMeierCurve = {
    n,
    time: [],
    atRisk: [],
    events: [],
    censored: [],
    survival: [],
    greenwood: [],
  };
  let atRisk = n;
  let s = 1;
  let g = 0;
  for (let i = 0; i < table.time.length; i++) {
    const d = table.events[i]!;
    const c = table.censored[i]!;
    if (d + c === 0) continue;
    if (d > 0) {
      s *= 1 - d / atRisk;
      g += d === atRisk ? Infinity : d / (atRisk * (atRisk - d));
    }
    curve.time.push(table.time[i]!);
    curve.atRisk.push(atRisk);
    curve.events.push(d);
    curve.censored.push(c);
    curve.survival.push(s);
    curve.greenwood.push(g);
    atRisk -= d + c;
  }
  return curve;
}

/**
 * Ŝ(t) of a curve by binary search, or null where it is not estimated: beyond the largest
 * observed time while Ŝ > 0, or on an empty curve. Ŝ = 1 before the first time.
 */
export function survivalAt(curve: KaplanMeierCurve, t: number): number | null {
  const i = lastAtOrBefore(curve.time, t);
  const last = curve.time.length - 1;
  if (last < 0) return null;
  const s = i < 0 ? 1 : curve.survival[i]!;
  if (t > curve.time[last]! && s > 0) return null;
  return s;
}

export interface EventProbability {
  /** 1 − Ŝ(t): the probability of an event within t; null when not estimated. */
  probability: number | null;
  /** Greenwood standard error of Ŝ(t) (and of 1 − Ŝ(t)); null where undefined (Ŝ = 0). */
  standardError: number | null;
  interval: Interval | null;
  /** Observations with time ≥ t (followed for all of t, or with an event at t). */
  atRisk: number;
  /** Whether the estimate reaches t. */
  reached: boolean;
}

const clamp01 = (x: number): number => Math.min(1, Math.max(0, x));

/**
 * Probability of an event within t from a Kaplan–Meier curve, 1 − Ŝ(t), with its Greenwood
 * standard error and a log–log interval (Kalbfleisch & Prentice (1980), "The Statistical
 * Analysis of Failure Time Data", §1.3): with V the Greenwood sum, σ = √V / |ln Ŝ| and
 * Ŝ^exp(±zσ) as the limits of Ŝ, so they stay in (0, 1).
 *
 * The log–log form is undefined where Ŝ is 0 or 1; there the interval is exact binomial
 * (Clopper & Pearson 1934) on the observations it rests on: no event by t gives
 * [0, 1 − (α/2)^(1/m)], m the observations followed through t (all the jobs when none were
 * censored before t); Ŝ = 0 gives [(α/2)^(1/m), 1], m all the jobs when none were censored
 * before the curve reached 0, else the risk set of the step that took it to 0 (conservative,
 * since 1 − Ŝ(t) ≥ that step's hazard).
 *
 * Not reached (probability, error and interval null, reached false): an empty curve, or t
 * beyond the largest observed time while Ŝ > 0.
 */
export function eventProbability(
  curve: KaplanMeierCurve,
  t: number,
  confidence = 0.95,
): EventProbability {
  if (!(confidence > 0 && confidence < 1)) {
    throw new RangeError(`confidence must be in (0, 1), got ${confidence}`);
  }
  const next = firstAtLeast(curve.time, t);
  const atRisk = next < curve.time.length ? curve.atRisk[next]! : 0;
  const s = survivalAt(curve, t);
  if (s === null) {
    return { probability: null, standardError: null, interval: null, atRisk, reached: false };
  }
  const tail = (1 - confidence) / 2;
  const i = lastAtOrBefore(curve.time, t);
  const g = i < 0 ? 0 : curve.greenwood[i]!;
  if (s === 1) {
    const m = atRisk > 0 ? atRisk : curve.n;
    return {
      probability: 0,
      standardError: 0,
      interval: { lower: 0, upper: m > 0 ? 1 - tail ** (1 / m) : 1 },
      atRisk,
      reached: true,
    };
  }
  if (s === 0) {
    const zeroAt = curve.survival.findIndex((v) => v === 0);
    const censoredBefore = curve.censored.slice(0, zeroAt).some((c) => c > 0);
    const m = censoredBefore ? curve.atRisk[zeroAt]! : curve.n;
    return {
      probability: 1,
      standardError: null,
      interval: { lower: tail ** (1 / m), upper: 1 },
      atRisk,
      reached: true,
    };
  }
  const z = normalQuantile(1 - tail);
  const sigma = Math.sqrt(g) / Math.abs(Math.log(s));
  const sLower = s ** Math.exp(z * sigma);
  const sUpper = s ** Math.exp(-z * sigma);
  return {
    probability: 1 - s,
    standardError: s * Math.sqrt(g),
    interval: { lower: clamp01(1 - sUpper), upper: clamp01(1 - sLower) },
    atRisk,
    reached: true,
  };
}

/** Nelson–Aalen cumulative hazard, a right-continuous step function over the event times. */
export interface CumulativeHazard {
  /** Event times, ascending. */
  time: number[];
  /** Ĥ(t) at each event time. */
  hazard: number[];
  /** Var Ĥ(t) = Σ dⱼ/nⱼ² at each event time. */
  variance: number[];
  /** Largest observed time of the reference (Ĥ is held flat beyond it). */
  lastTime: number;
}

/**
 * Nelson–Aalen estimate of the cumulative hazard: Nelson (1972) Technometrics 14:945–966;
 * Aalen (1978) Annals of Statistics 6:701–726. Ĥ(t) = Σ over event times tⱼ ≤ t of dⱼ/nⱼ, with
 * variance Σ dⱼ/nⱼ² (Klein & Moeschberger, "Survival Analysis", §4.2). Build it once from a
 * reference table with long follow-up, then evaluate with `hazardAt`.
 */
export function nelsonAalen(table: SurvivalTable): CumulativeHazard {
  checkTable(table);
  let atRisk = 0;
  for (let i = 0; i < table.time.length; i++) atRisk += table.events[i]! + table.censored[i]!;
  const out: CumulativeHazard = { time: [], hazard: [], variance: [], lastTime: 0 };
  let h = 0;
  let v = 0;
  for (let i = 0; i < table.time.length; i++) {
    const d = table.events[i]!;
    const c = table.censored[i]!;
    if (d + c > 0) out.lastTime = table.time[i]!;
    if (d > 0) {
      h += d / atRisk;
      v += d / (atRisk * atRisk);
      out.time.push(table.time[i]!);
      out.hazard.push(h);
      out.variance.push(v);
    }
    atRisk -= d + c;
  }
  return out;
}

/**
 * Ĥ(t) by binary search over the event times: 0 before the first, held at its last value after
 * the last (the reference should be followed for at least as long as any t asked for).
 */
export function hazardAt(hazard: CumulativeHazard, t: number): number {
  const i = lastAtOrBefore(hazard.time, t);
  return i < 0 ? 0 : hazard.hazard[i]!;
}

/**
 * Expected events E = Σ over the table's observations of Ĥ(tᵢ), each at its own follow-up time
 * (event or censoring): the expected count under the reference hazard, as in the one-sample
 * log-rank test and the standardized ratio O/E (Breslow & Day (1987), "Statistical Methods in
 * Cancer Research" vol. II, §2.3). One binary search per distinct time.
 */
export function expectedEvents(table: SurvivalTable, hazard: CumulativeHazard): number {
  checkTable(table);
  let e = 0;
  for (let i = 0; i < table.time.length; i++) {
    const k = table.events[i]! + table.censored[i]!;
    if (k > 0) e += k * hazardAt(hazard, table.time[i]!);
  }
  return e;
}
