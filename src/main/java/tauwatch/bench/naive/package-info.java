/**
 * A deliberately plain pipeline, the way a first version is usually written — one object per sample
 * through a {@link java.util.concurrent.BlockingQueue}, a growing list per pulse window, and every
 * transient fitted by Commons Math Levenberg–Marquardt from a fixed generic start — kept only as
 * the baseline column of {@code tauwatch bench}. It is correct (its estimates agree with the
 * product's within the tolerances the benchmark checks) but it is not the product: nothing outside
 * {@code tauwatch.bench} may use it.
 */
package tauwatch.bench.naive;
