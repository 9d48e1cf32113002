/**
 * Comparing two partitions of the same items (e.g. discovered clusters against themes coders
 * later gave): adjusted Rand index and normalised mutual information, with scikit-learn's
 * definitions and special cases so that its values check ours.
 */

type Labels = readonly (string | number)[];

interface Contingency {
  n: number;
  rows: number[]; // class sizes
  cols: number[]; // cluster sizes
  /** Non-zero cells with the sizes of their class and cluster. */
  cells: { count: number; row: number; col: number }[];
}

function contingency(a: Labels, b: Labels): Contingency {
  if (a.length !== b.length) throw new RangeError(`the two labellings differ in length (${a.length} and ${b.length})`);
  const ra = new Map<string | number, number>();
  const cb = new Map<string | number, number>();
  const cell = new Map<string, { x: string | number; y: string | number; count: number }>();
  for (let i = 0; i < a.length; i++) {
    const x = a[i]!;
    const y = b[i]!;
    ra.set(x, (ra.get(x) ?? 0) + 1);
    cb.set(y, (cb.get(y) ?? 0) + 1);
    // JSON keeps 1 and '1' apart, as the label maps do.
    const key = JSON.stringify([x, y]);
    const c = cell.get(key);
    if (c) c.count++;
    else cell.set(key, { x, y, count: 1 });
  }
  const cells = [...cell.values()].map((c) => ({ count: c.count, row: ra.get(c.x)!, col: cb.get(c.y)! }));
  return { n: a.length, rows: [...ra.values()], cols: [...cb.values()], cells };
}

const pairs = (m: number): number => (m * (m - 1)) / 2;

/**
 * Adjusted Rand index (Hubert and Arabie 1985): the Rand index corrected for chance, 1 for
 * identical partitions (up to renaming), about 0 for independent ones, negative below chance.
 * Like scikit-learn, identical partitions (including the degenerate all-in-one or all-apart
 * cases, where the correction is 0 / 0) score 1.
 */
export function adjustedRandIndex(a: Labels, b: Labels): number {
  const { n, rows, cols, cells } = contingency(a, b);
  const sumCells = cells.reduce((s, c) => s + pairs(c.count), 0);
  const sumRows = rows.reduce((s, m) => s + pairs(m), 0);
  const sumCols = cols.reduce((s, m) => s + pairs(m), 0);
  // No pair split one way and joined the other: the same partition.
  if (sumRows === sumCells && sumCols === sumCells) return 1;
  const expected = (sumRows * sumCols) / pairs(n);
  const max = (sumRows + sumCols) / 2;
  return (sumCells - expected) / (max - expected);
}

/** Shannon entropy (natural log) of a labelling given its group sizes. */
function entropy(sizes: number[], n: number): number {
  let h = 0;
  for (const m of sizes) if (m > 0) h -= (m / n) * Math.log(m / n);
  return h;
}

/**
 * Normalised mutual information, MI / ((H(a) + H(b)) / 2): scikit-learn's default
 * ('arithmetic') normalisation, equal to the V-measure. 1 when both labellings put everything
 * in one group (scikit-learn's convention); 0 when the mutual information is 0.
 */
export function normalizedMutualInfo(a: Labels, b: Labels): number {
  const { n, rows, cols, cells } = contingency(a, b);
  if ((rows.length === 1 && cols.length === 1) || n === 0) return 1;
  let mi = 0;
  for (const c of cells) mi += (c.count / n) * Math.log((c.count * n) / (c.row * c.col));
  mi = Math.max(0, mi); // rounding can take an MI of 0 just below it
  if (mi === 0) return 0;
  return mi / ((entropy(rows, n) + entropy(cols, n)) / 2);
}
