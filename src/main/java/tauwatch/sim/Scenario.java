package tauwatch.sim;

/**
 * A simulated recording as a scenario file describes it: the protocol, the amplifier, and how the
 * cell changes over time.
 *
 * <p>Immutable.
 *
 * @param name short name, e.g. {@code steady-cell}
 * @param description one or two sentences for people
 * @param durationS suggested length of the recording, s
 * @param seed default seed of the noise
 * @param protocol the test-pulse command
 * @param amplifier sampling, filter, noise, hum and digitiser
 * @param schedule the cell's parameters over time
 * @param synaptic spontaneous synaptic currents ({@link SynapticActivity#NONE} for none)
 * @param spikes current clamp: action potentials above a threshold ({@link SpikeWaveform#NONE})
 */
public record Scenario(
    String name,
    String description,
    double durationS,
    long seed,
    TestPulseProtocol protocol,
    AmplifierSettings amplifier,
    ParameterSchedule schedule,
    SynapticActivity synaptic,
    SpikeWaveform spikes) {

  /** A scenario without synaptic events or spikes. */
  public Scenario(
      String name,
      String description,
      double durationS,
      long seed,
      TestPulseProtocol protocol,
      AmplifierSettings amplifier,
      ParameterSchedule schedule) {
    this(
        name,
        description,
        durationS,
        seed,
        protocol,
        amplifier,
        schedule,
        SynapticActivity.NONE,
        SpikeWaveform.NONE);
  }

  public Scenario {
    if (name == null || name.isBlank()) {
      throw new IllegalArgumentException("scenario name must not be blank");
    }
    if (!(durationS > 0) || Double.isInfinite(durationS)) {
      throw new IllegalArgumentException("duration (s) must be > 0, got " + durationS);
    }
    if (protocol == null || amplifier == null || schedule == null) {
      throw new IllegalArgumentException("scenario needs a protocol, an amplifier and a schedule");
    }
    description = description == null ? "" : description;
    synaptic = synaptic == null ? SynapticActivity.NONE : synaptic;
    spikes = spikes == null ? SpikeWaveform.NONE : spikes;
  }

  /** The cell's truth at {@code tS}, see {@link CellTruth}. */
  public CellTruth truthAt(double tS) {
    return CellTruth.of(tS, schedule.at(tS), protocol.holdingMv());
  }
}
