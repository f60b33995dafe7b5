// MIL-STD-105E (1989) "Sampling procedures and tables for inspection by attributes", public
// domain; the same tables as ANSI/ASQ Z1.4 and ISO 2859-1. Percent-nonconforming AQLs 0.010–10.

export type InspectionLevel = 'S-1' | 'S-2' | 'S-3' | 'S-4' | 'I' | 'II' | 'III';
export type Severity = 'normal' | 'tightened' | 'reduced';

export const INSPECTION_LEVELS: readonly InspectionLevel[] = [
  'S-1',
  'S-2',
  'S-3',
  'S-4',
  'I',
  'II',
  'III',
];

/** Table I — Sample size code letters: [largest lot size, S-1, S-2, S-3, S-4, I, II, III]. */
export const TABLE_I: ReadonlyArray<
  readonly [number, string, string, string, string, string, string, string]
> = [
  [8, 'A', 'A', 'A', 'A', 'A', 'A', 'B'],
  [15, 'A', 'A', 'A', 'A', 'A', 'B', 'C'],
  [25, 'A', 'A', 'B', 'B', 'B', 'C', 'D'],
  [50, 'A', 'B', 'B', 'C', 'C', 'D', 'E'],
  [90, 'B', 'B', 'C', 'C', 'C', 'E', 'F'],
  [150, 'B', 'B', 'C', 'D', 'D', 'F', 'G'],
  [280, 'B', 'C', 'D', 'E', 'E', 'G', 'H'],
  [500, 'B', 'C', 'D', 'E', 'F', 'H', 'J'],
  [1200, 'C', 'C', 'E', 'F', 'G', 'J', 'K'],
  [3200, 'C', 'D', 'E', 'G', 'H', 'K', 'L'],
  [10000, 'C', 'D', 'F', 'G', 'J', 'L', 'M'],
  [35000, 'C', 'D', 'F', 'H', 'K', 'M', 'N'],
  [150000, 'D', 'E', 'G', 'J', 'L', 'N', 'P'],
  [500000, 'D', 'E', 'G', 'J', 'M', 'P', 'Q'],
  [Infinity, 'D', 'E', 'H', 'K', 'N', 'Q', 'R'],
];

/** Column heads of Tables II-A to II-C used here (AQL in percent nonconforming). */
export const AQLS: readonly number[] = [
  0.01, 0.015, 0.025, 0.04, 0.065, 0.1, 0.15, 0.25, 0.4, 0.65, 1, 1.5, 2.5, 4, 6.5, 10,
];

/** Sample sizes by code letter: Tables II-A and II-B (S appears in II-B only). */
export const SAMPLE_SIZES: Readonly<Record<string, number>> = {
  A: 2,
  B: 3,
  C: 5,
  D: 8,
  E: 13,
  F: 20,
  G: 32,
  H: 50,
  J: 80,
  K: 125,
  L: 200,
  M: 315,
  N: 500,
  P: 800,
  Q: 1250,
  R: 2000,
  S: 3150,
};

/** Sample sizes by code letter under reduced inspection: Table II-C. */
export const REDUCED_SAMPLE_SIZES: Readonly<Record<string, number>> = {
  A: 2,
  B: 2,
  C: 2,
  D: 3,
  E: 5,
  F: 8,
  G: 13,
  H: 20,
  J: 32,
  K: 50,
  L: 80,
  M: 125,
  N: 200,
  P: 315,
  Q: 500,
  R: 800,
};

// Cells read as printed: "Ac/Re", ↓ = use the first plan below, ↑ = use the first plan above,
// · = no entry.

/** Table II-A — Single sampling plans for normal inspection (master table). */
const TABLE_II_A = `
  AQL 0.010 0.015 0.025 0.040 0.065  0.10  0.15  0.25  0.40  0.65   1.0   1.5   2.5   4.0   6.5    10
  A     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓
  B     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓
  C     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2
  D     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3
  E     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4
  F     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6
  G     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8
  H     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11
  J     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11 14/15
  K     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11 14/15 21/22
  L     ↓     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11 14/15 21/22     ↑
  M     ↓     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11 14/15 21/22     ↑     ↑
  N     ↓     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11 14/15 21/22     ↑     ↑     ↑
  P     ↓   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11 14/15 21/22     ↑     ↑     ↑     ↑
  Q   0/1     ↑     ↓   1/2   2/3   3/4   5/6   7/8 10/11 14/15 21/22     ↑     ↑     ↑     ↑     ↑
  R     ↑     ↑   1/2   2/3   3/4   5/6   7/8 10/11 14/15 21/22     ↑     ↑     ↑     ↑     ↑     ↑
`;

/** Table II-B — Single sampling plans for tightened inspection (master table). */
const TABLE_II_B = `
  AQL 0.010 0.015 0.025 0.040 0.065  0.10  0.15  0.25  0.40  0.65   1.0   1.5   2.5   4.0   6.5    10
  A     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓
  B     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓
  C     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓
  D     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2
  E     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3
  F     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4
  G     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6
  H     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9
  J     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9 12/13
  K     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9 12/13 18/19
  L     ↓     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9 12/13 18/19     ↑
  M     ↓     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9 12/13 18/19     ↑     ↑
  N     ↓     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9 12/13 18/19     ↑     ↑     ↑
  P     ↓     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9 12/13 18/19     ↑     ↑     ↑     ↑
  Q     ↓   0/1     ↓     ↓   1/2   2/3   3/4   5/6   8/9 12/13 18/19     ↑     ↑     ↑     ↑     ↑
  R   0/1     ↑     ↓   1/2   2/3   3/4   5/6   8/9 12/13 18/19     ↑     ↑     ↑     ↑     ↑     ↑
  S     ·     ·   1/2     ·     ·     ·     ·     ·     ·     ·     ·     ·     ·     ·     ·     ·
`;

/** Table II-C — Single sampling plans for reduced inspection (master table). */
const TABLE_II_C = `
  AQL 0.010 0.015 0.025 0.040 0.065  0.10  0.15  0.25  0.40  0.65   1.0   1.5   2.5   4.0   6.5    10
  A     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↓
  B     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓
  C     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2
  D     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3
  E     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4
  F     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5
  G     ↓     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6
  H     ↓     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8
  J     ↓     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8  7/10
  K     ↓     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8  7/10 10/13
  L     ↓     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8  7/10 10/13     ↑
  M     ↓     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8  7/10 10/13     ↑     ↑
  N     ↓     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8  7/10 10/13     ↑     ↑     ↑
  P     ↓   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8  7/10 10/13     ↑     ↑     ↑     ↑
  Q   0/1     ↑     ↓   0/2   1/3   1/4   2/5   3/6   5/8  7/10 10/13     ↑     ↑     ↑     ↑     ↑
  R     ↑     ↑   0/2   1/3   1/4   2/5   3/6   5/8  7/10 10/13     ↑     ↑     ↑     ↑     ↑     ↑
`;

export type Cell = { accept: number; reject: number } | '↓' | '↑' | null;

export interface MasterTable {
  letters: string[];
  cells: Cell[][];
}

function parseTable(text: string): MasterTable {
  const letters: string[] = [];
  const cells: Cell[][] = [];
  for (const line of text.split('\n')) {
    const tokens = line.trim().split(/\s+/);
    if (tokens.length !== AQLS.length + 1 || tokens[0] === 'AQL') continue;
    letters.push(tokens[0]!);
    cells.push(
      tokens.slice(1).map((t): Cell => {
        if (t === '↓' || t === '↑') return t;
        if (t === '·') return null;
        const [ac, re] = t.split('/').map(Number);
        return { accept: ac!, reject: re! };
      }),
    );
  }
  return { letters, cells };
}

export const MASTER_TABLES: Readonly<Record<Severity, MasterTable>> = {
  normal: parseTable(TABLE_II_A),
  tightened: parseTable(TABLE_II_B),
  reduced: parseTable(TABLE_II_C),
};
