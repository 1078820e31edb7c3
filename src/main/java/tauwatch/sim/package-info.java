/**
 * The simulated cell: a whole-cell patch under ideal voltage clamp, its amplifier's output filter,
 * noise and digitiser, and the drift scenarios that change the cell during a recording.
 *
 * <p>Units inside the circuit model are chosen so that no conversion factor appears in the
 * equations: millivolts, picoamperes, gigaohms, picofarads and milliseconds (mV / GΩ = pA, GΩ · pF
 * = ms, pF · mV / ms = pA). Public records carry the trade's units (MΩ, pF, mV, GΩ for the seal).
 */
package tauwatch.sim;
