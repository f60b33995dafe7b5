import {
  AQLS,
  INSPECTION_LEVELS,
  type InspectionLevel,
  MASTER_TABLES,
  REDUCED_SAMPLE_SIZES,
  SAMPLE_SIZES,
  type Severity,
  TABLE_I,
} from './tables';

function checkLotSize(lotSize: number): void {
  if (!Number.isInteger(lotSize) || lotSize < 1) {
    throw new RangeError(`lotSize must be a positive integer, got ${lotSize}`);
  }
}

/**
 * Sample size code letter from MIL-STD-105E Table I (= ANSI/ASQ Z1.4 Table I, ISO 2859-1
 * Table 1) for a lot size and inspection level; general level II by default. A lot of one
 * item is read in the 2–8 row. Throws RangeError on a lot size that is not a positive
 * integer or an unknown level.
 */
export function sampleSizeCodeLetter(lotSize: number, level: InspectionLevel = 'II'): string {
  checkLotSize(lotSize);
  const column = INSPECTION_LEVELS.indexOf(level);
  if (column < 0) throw new RangeError(`Unknown inspection level "${String(level)}"`);
  const row = TABLE_I.find((r) => lotSize <= r[0])!;
  return row[column + 1] as string;
}

/** Column of an AQL in Tables II-A to II-C, matching the printed values (0.65, 1.0, 2.5 …). */
export function aqlColumn(aql: number): number {
  const j = AQLS.findIndex((a) => Math.abs(a - aql) <= a * 1e-9);
  if (j < 0) {
    throw new RangeError(
      `AQL ${aql} is not a column of MIL-STD-105E Tables II-A to II-C (0.010–10)`,
    );
  }
  return j;
}

export interface TablePlan {
  /** Code letter whose sample size the plan uses, after following the table's arrows. */
  codeLetter: string;
  sampleSize: number;
  accept: number;
  reject: number;
}

/** Reads a master table at (letter, AQL), following ↓ and ↑ until a plan is found. */
export function tablePlan(severity: Severity, codeLetter: string, aql: number): TablePlan {
  const table = MASTER_TABLES[severity];
  const column = aqlColumn(aql);
  let row = table.letters.indexOf(codeLetter);
  if (row < 0) throw new RangeError(`Unknown code letter "${codeLetter}"`);
  for (;;) {
    const cell = table.cells[row]?.[column];
    if (cell === '↓') row++;
    else if (cell === '↑') row--;
    else if (cell) {
      const letter = table.letters[row]!;
      const sizes = severity === 'reduced' ? REDUCED_SAMPLE_SIZES : SAMPLE_SIZES;
      return { codeLetter: letter, sampleSize: sizes[letter]!, ...cell };
    } else {
      throw new Error(
        `MIL-STD-105E table for ${severity} inspection has no plan at ${codeLetter}, AQL ${aql}`,
      );
    }
  }
}

export interface SingleSamplingPlan extends TablePlan {
  /** Code letter Table I gives for the lot, before any arrow was followed. */
  lotCodeLetter: string;
  /** True when the sample is the whole lot (the table's sample size reached the lot size). */
  hundredPercent: boolean;
}

/**
 * Single sampling plan per MIL-STD-105E (ISO 2859-1, ANSI/ASQ Z1.4): code letter from
 * Table I, then Table II-A (normal), II-B (tightened) or II-C (reduced) at the AQL, following
 * the arrows ("use the first sampling plan below/above the arrow"); the sample size is that
 * of the letter where the plan is found, reported as `codeLetter`. When that sample size
 * reaches the lot size, the whole lot is inspected with the same accept and reject numbers.
 *
 * Reject a lot when nonconforming ≥ reject, accept when ≤ accept. Under reduced inspection
 * Table II-C may leave a gap (e.g. 1/4): a count in between accepts the lot but reinstates
 * normal inspection (§8.3.4 b), which `nextSeverity` applies.
 *
 * AQLs are the table's percent-nonconforming columns 0.010–10; any other value throws
 * RangeError, as do lot sizes that are not positive integers.
 */
export function singleSamplingPlan(
  lotSize: number,
  aql: number,
  options: { level?: InspectionLevel; severity?: Severity } = {},
): SingleSamplingPlan {
  const lotCodeLetter = sampleSizeCodeLetter(lotSize, options.level ?? 'II');
  const plan = tablePlan(options.severity ?? 'normal', lotCodeLetter, aql);
  const hundredPercent = plan.sampleSize >= lotSize;
  return {
    ...plan,
    sampleSize: Math.min(plan.sampleSize, lotSize),
    lotCodeLetter,
    hundredPercent,
  };
}
