/**
 * Rearranges `a` so that a[k] is the value that would stand at index k if `a[left..right]` were
 * sorted in increasing order, with every value before it ≤ a[k] and every value after it ≥ a[k]:
 * the Floyd–Rivest selection algorithm, expected time linear in the length.
 *
 * Reference: R. W. Floyd and R. L. Rivest (1975), "Algorithm 489: The algorithm SELECT — for
 * finding the ith smallest of n elements", Communications of the ACM 18(3), 173.
 *
 * Example: `selectInPlace(Float64Array.of(5, 1, 4, 2, 3), 2)` leaves 3 at index 2.
 * The values must not be NaN.
 */
export function selectInPlace(a: Float64Array, k: number, left = 0, right = a.length - 1): void {
  while (right > left) {
    if (right - left > 600) {
      const n = right - left + 1;
      const m = k - left + 1;
      const z = Math.log(n);
      const s = 0.5 * Math.exp((2 * z) / 3);
      const sd = 0.5 * Math.sqrt((z * s * (n - s)) / n) * (m - n / 2 < 0 ? -1 : 1);
      const newLeft = Math.max(left, Math.floor(k - (m * s) / n + sd));
      const newRight = Math.min(right, Math.floor(k + ((n - m) * s) / n + sd));
      selectInPlace(a, k, newLeft, newRight);
    }
    const t = a[k];
    let i = left;
    let j = right;
    swap(a, left, k);
    if (a[right] > t) swap(a, left, right);
    while (i < j) {
      swap(a, i, j);
      i++;
      j--;
      while (a[i] < t) i++;
      while (a[j] > t) j--;
    }
    if (a[left] === t) swap(a, left, j);
    else {
      j++;
      swap(a, j, right);
    }
    if (j <= k) left = j + 1;
    if (k <= j) right = j - 1;
  }
}

function swap(a: Float64Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}

/** The smallest value of a[from..a.length-1]. */
export function minFrom(a: Float64Array, from: number): number {
  let m = a[from];
  for (let i = from + 1; i < a.length; i++) if (a[i] < m) m = a[i];
  return m;
}

/** How many values are ≤ x. */
export function countAtMost(a: ArrayLike<number>, x: number): number {
  let c = 0;
  for (let i = 0; i < a.length; i++) if (a[i] <= x) c++;
  return c;
}
