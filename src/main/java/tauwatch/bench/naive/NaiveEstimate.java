package tauwatch.bench.naive;

/**
 * One pulse's estimate from the naive pipeline.
 *
 * <p>Immutable.
 */
public record NaiveEstimate(
    long pulse,
    double onsetS,
    double raMOhm,
    double rinMOhm,
    double rtMOhm,
    double cmPf,
    double tauMs,
    double holdPa,
    boolean accepted,
    long pulseEndReceivedNanos) {}
