package tauwatch.health;

/**
 * The median of an array's first values, found by selection (Hoare's FIND, median-of-three pivot)
 * in linear expected time rather than by sorting.
 *
 * <p>Stateless; allocates nothing. The values are reordered in place, so callers pass a scratch
 * copy; they must not contain NaN. The result equals the sorted-array median (the mean of the two
 * middle values for an even count).
 */
public final class Medians {
  /** Below this many values a range is finished by insertion, which is faster than partitioning. */
  private static final int INSERTION_BELOW = 12;

  private Medians() {}

  /** The median of {@code a[0..n)}, reordering it; NaN when {@code n == 0}. */
  public static double inPlace(double[] a, int n) {
    if (n == 0) {
      return Double.NaN;
    }
    int k = n / 2;
    select(a, n, k);
    if ((n & 1) == 1) {
      return a[k];
    }
    // After selection every value left of k is ≤ a[k]: the lower middle is their maximum.
    double lower = a[0];
    for (int i = 1; i < k; i++) {
      if (a[i] > lower) {
        lower = a[i];
      }
    }
    return 0.5 * (lower + a[k]);
  }

  /** Puts the k-th smallest of {@code a[0..n)} at k, with no larger value left of it. */
  static void select(double[] a, int n, int k) {
    int lo = 0;
    int hi = n - 1;
    while (hi - lo >= INSERTION_BELOW) {
      int mid = (lo + hi) >>> 1;
      // Median of three to a[mid], with a[lo] ≤ a[mid] ≤ a[hi] as sentinels for the scans.
      if (a[mid] < a[lo]) {
        swap(a, mid, lo);
      }
      if (a[hi] < a[lo]) {
        swap(a, hi, lo);
      }
      if (a[hi] < a[mid]) {
        swap(a, hi, mid);
      }
      double pivot = a[mid];
      int i = lo;
      int j = hi;
      while (i <= j) {
        while (a[i] < pivot) {
          i++;
        }
        while (a[j] > pivot) {
          j--;
        }
        if (i <= j) {
          swap(a, i, j);
          i++;
          j--;
        }
      }
      // Now a[lo..j] ≤ pivot ≤ a[i..hi], and any index between j and i holds the pivot.
      if (k <= j) {
        hi = j;
      } else if (k >= i) {
        lo = i;
      } else {
        return;
      }
    }
    for (int i = lo + 1; i <= hi; i++) {
      double v = a[i];
      int j = i - 1;
      while (j >= lo && a[j] > v) {
        a[j + 1] = a[j];
        j--;
      }
      a[j + 1] = v;
    }
  }

  private static void swap(double[] a, int i, int j) {
    double t = a[i];
    a[i] = a[j];
    a[j] = t;
  }
}
