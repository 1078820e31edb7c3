package tauwatch.health;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** Selection against the reference: the middle of the JDK's {@link Arrays#sort}ed copy. */
class MediansTest {
  private static double sortedMedian(double[] v, int n) {
    double[] s = Arrays.copyOf(v, n);
    Arrays.sort(s);
    return n % 2 == 1 ? s[n / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
  }

  @Test
  void medianEqualsTheSortedMiddleForManyShapesAndSizes() {
    Random rnd = new Random(20261202);
    for (int trial = 0; trial < 3000; trial++) {
      int n = 1 + rnd.nextInt(300);
      double[] v = new double[n + 5];
      int shape = trial % 5;
      for (int i = 0; i < v.length; i++) {
        v[i] =
            switch (shape) {
              case 0 -> rnd.nextGaussian();
              case 1 -> rnd.nextInt(4); // many ties
              case 2 -> i; // already sorted
              case 3 -> -i; // reversed
              default -> i % 7 == 0 ? 1e6 * rnd.nextGaussian() : rnd.nextDouble(); // outliers
            };
      }
      double expected = sortedMedian(v, n);
      double[] work = v.clone();
      assertEquals(expected, Medians.inPlace(work, n), 0.0, "trial " + trial + ", n " + n);
      double[] before = Arrays.copyOf(v, n);
      double[] after = Arrays.copyOf(work, n);
      Arrays.sort(before);
      Arrays.sort(after);
      assertTrue(Arrays.equals(before, after), "the values are only reordered");
      assertEquals(v[n], work[n], 0.0, "values past n are not touched");
    }
  }

  @Test
  void selectionLeavesNoLargerValueBeforeTheKth() {
    Random rnd = new Random(7);
    for (int trial = 0; trial < 500; trial++) {
      int n = 1 + rnd.nextInt(200);
      int k = rnd.nextInt(n);
      double[] v = new double[n];
      for (int i = 0; i < n; i++) {
        v[i] = rnd.nextInt(50);
      }
      double[] s = v.clone();
      Arrays.sort(s);
      Medians.select(v, n, k);
      assertEquals(s[k], v[k], 0.0);
      for (int i = 0; i < k; i++) {
        assertTrue(v[i] <= v[k]);
      }
      for (int i = k + 1; i < n; i++) {
        assertTrue(v[i] >= v[k]);
      }
    }
  }

  @Test
  void noValuesHaveNoMedian() {
    assertTrue(Double.isNaN(Medians.inPlace(new double[3], 0)));
  }
}
