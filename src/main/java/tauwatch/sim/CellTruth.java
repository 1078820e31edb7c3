package tauwatch.sim;

/**
 * The simulated cell's true circuit at one moment, and what an ideal estimator of the RC model
 * should read at the pipette.
 *
 * <p>Immutable. Derivation (ideal clamp, step ΔV from holding Vh; units GΩ, pF, ms, mV, pA):
 *
 * <ul>
 *   <li>The seal Rs joins the pipette to the bath. Under an ideal clamp its current Vp/Rs follows
 *       the command instantly and never loads the membrane, so the transient's time course is that
 *       of the cell alone while both the instantaneous and the steady currents gain ΔV/Rs.
 *   <li>Instantaneous current I_0 = ΔV/Ra + ΔV/Rs, so the apparent access resistance is {@code
 *       accessMOhm = Ra ∥ Rs}.
 *   <li>Steady current I_∞ = ΔV/(Ra + Rin) + ΔV/Rs with the cell's input resistance Rin (Rm, or Rm
 *       ∥ (Rax + Rd) with a dendrite), so {@code totalMOhm = (Ra + Rin) ∥ Rs} and {@code inputMOhm
 *       = totalMOhm − accessMOhm}.
 *   <li>Charge of the transient Q = ∫(I − I_∞)dt = −(1/Ra)·[M⁻¹ Δ∞]_soma, where M is the node
 *       matrix with the pipette clamped and Δ∞ the steady change of the node voltages; for one
 *       compartment Q = Cm ΔV (Rm/(Ra + Rm))² (CHECKS.md).
 *   <li>{@code tauMs = Q / (I_0 − I_∞)}, the transient's area over its initial amplitude; for one
 *       compartment exactly τ = Ra·Rm·Cm/(Ra + Rm), for two a weighted mean of the two time
 *       constants {@code fastTauMs}, {@code slowTauMs} (the eigenvalues of M).
 *   <li>{@code capacitancePf = tau·totalMOhm/(accessMOhm·inputMOhm)}: the RC model's Cm from τ and
 *       the apparent resistances, which equals Cm for one compartment with a perfect seal. {@code
 *       chargeCapacitancePf = Q/ΔV · (totalMOhm/inputMOhm)²}: the charge-based estimate; equal to
 *       Cm in the same case. With a dendrite both lie between Cm and {@code totalCapacitancePf} =
 *       Cm + Cd (the clamp charges only part of the dendrite).
 *   <li>{@code holdingPa = (Vh − E_L)/(Ra + Rin) + Vh/Rs}, the steady current at the holding
 *       potential.
 * </ul>
 *
 * @param timeS stream time the values hold for
 * @param cell the circuit
 * @param accessMOhm apparent access resistance, MΩ
 * @param inputMOhm apparent input resistance (access excluded), MΩ
 * @param totalMOhm apparent total resistance seen from the pipette, MΩ
 * @param capacitancePf RC-model capacitance from tau, pF
 * @param chargeCapacitancePf capacitance from the transient's charge, pF
 * @param tauMs time constant of the transient, ms
 * @param holdingPa steady holding current at the holding potential, pA
 * @param totalCapacitancePf all membrane capacitance of the cell (soma + dendrite), pF
 * @param fastTauMs the fastest time constant of the clamped cell, ms (equals tauMs for one
 *     compartment)
 * @param slowTauMs the slow time constant with a dendrite, ms; NaN for one compartment
 */
public record CellTruth(
    double timeS,
    CellParameters cell,
    double accessMOhm,
    double inputMOhm,
    double totalMOhm,
    double capacitancePf,
    double chargeCapacitancePf,
    double tauMs,
    double holdingPa,
    double totalCapacitancePf,
    double fastTauMs,
    double slowTauMs) {

  /** The truth for a cell held at {@code holdingMv}. */
  public static CellTruth of(double timeS, CellParameters cell, double holdingMv) {
    double ra = cell.accessMOhm() / 1000.0;
    double rm = cell.membraneMOhm() / 1000.0;
    double cm = cell.membraneCapacitancePf();
    double rs = cell.sealGOhm();
    double ga = 1 / ra;
    double gm = 1 / rm;
    double rin;
    double chargePerMv; // Q/ΔV, pC per mV = pF
    double fast;
    double slow;
    if (!cell.hasDendrite()) {
      rin = rm;
      chargePerMv = cm * square(rm / (ra + rm));
      fast = ra * rm * cm / (ra + rm);
      slow = Double.NaN;
    } else {
      double rx = cell.axialMOhm() / 1000.0;
      double rd = cell.dendriteMOhm() / 1000.0;
      double cd = cell.dendriteCapacitancePf();
      double gx = 1 / rx;
      double gd = 1 / rd;
      rin = 1 / (gm + 1 / (rx + rd));
      // Node matrix M with the pipette clamped, and the soma's drive b·ΔV (b = ga/cm).
      double m00 = -(ga + gm + gx) / cm;
      double m01 = gx / cm;
      double m10 = gx / cd;
      double m11 = -(gx + gd) / cd;
      double det = m00 * m11 - m01 * m10;
      // Δ∞ = −M⁻¹ b per mV of step; M⁻¹ = [[m11, −m01], [−m10, m00]] / det.
      double b0 = ga / cm;
      double d0 = -(m11 * b0) / det;
      double d1 = -(-m10 * b0) / det;
      double inv0 = (m11 * d0 - m01 * d1) / det;
      chargePerMv = -ga * inv0;
      double halfTrace = 0.5 * (m00 + m11);
      double disc = Math.sqrt(halfTrace * halfTrace - det);
      fast = -1 / (halfTrace - disc);
      slow = -1 / (halfTrace + disc);
    }
    double access = parallel(ra, rs);
    double total = parallel(ra + rin, rs);
    double input = total - access;
    // I_0 − I_∞ per mV excludes the seal's share, which steps and stays.
    double amplitudePerMv = 1 / ra - 1 / (ra + rin);
    double tau = chargePerMv / amplitudePerMv;
    double capacitance = tau * total / (access * input);
    double chargeCapacitance = chargePerMv * square(total / input);
    double holding =
        (holdingMv - cell.leakReversalMv()) / (ra + rin)
            + (cell.hasSealLeak() ? holdingMv / rs : 0);
    return new CellTruth(
        timeS,
        cell,
        access * 1000,
        input * 1000,
        total * 1000,
        capacitance,
        chargeCapacitance,
        tau,
        holding,
        cm + cell.dendriteCapacitancePf(),
        fast,
        slow);
  }

  /**
   * The time constant of the unclamped cell, as current clamp sees it, for a perfect seal: Rm·Cm
   * for one compartment, the slowest mode of the soma–dendrite node matrix with a dendrite (the
   * eigenvalue of [[−(gm + gx)/Cm, gx/Cm], [gx/Cd, −(gx + gd)/Cd]] nearest zero).
   */
  public double currentClampTauMs() {
    double rm = cell.membraneMOhm() / 1000.0;
    double cm = cell.membraneCapacitancePf();
    if (!cell.hasDendrite()) {
      return rm * cm;
    }
    double gm = 1 / rm;
    double gx = 1000.0 / cell.axialMOhm();
    double gd = 1000.0 / cell.dendriteMOhm();
    double cd = cell.dendriteCapacitancePf();
    double m00 = -(gm + gx) / cm;
    double m01 = gx / cm;
    double m10 = gx / cd;
    double m11 = -(gx + gd) / cd;
    double halfTrace = 0.5 * (m00 + m11);
    double det = m00 * m11 - m01 * m10;
    return -1 / (halfTrace + Math.sqrt(halfTrace * halfTrace - det));
  }

  /**
   * The capacitance the clamp charges, as stored charge: Σ C_k·ΔV_k over the soma's ΔV at steady
   * state, pF — Cm for one compartment, Cm + Cd·Rd/(Rax + Rd) with a dendrite, whose steady ΔV is
   * the soma's divided down by Rd/(Rax + Rd) (CHECKS.md; the definition NEURON's fixtures use).
   *
   * <p>Why not {@link #chargeCapacitancePf}: that one scales the transient's charge ∫(I − I_∞)dt by
   * (Rt/Rin)², which is exact for one compartment but on a cable reads lower (the dendrite's leak
   * current during its slow charging is counted against it). The stored charge is what the
   * estimator's two-exponential Cm reports, and for a membrane with one time constant τ_m
   * everywhere (Rall's uniform model) it equals τ_m/Rin.
   */
  public double storedChargeCapacitancePf() {
    double cm = cell.membraneCapacitancePf();
    if (!cell.hasDendrite()) {
      return cm;
    }
    double rd = cell.dendriteMOhm();
    return cm + cell.dendriteCapacitancePf() * rd / (cell.axialMOhm() + rd);
  }

  /** The cell's input resistance without the electrode (Rm, or Rm ∥ (Rax + Rd)), MΩ. */
  public double cellInputMOhm() {
    double rm = cell.membraneMOhm();
    if (!cell.hasDendrite()) {
      return rm;
    }
    double branch = cell.axialMOhm() + cell.dendriteMOhm();
    return rm * branch / (rm + branch);
  }

  private static double parallel(double r1, double r2) {
    return Double.isInfinite(r2) ? r1 : r1 * r2 / (r1 + r2);
  }

  private static double square(double x) {
    return x * x;
  }
}
