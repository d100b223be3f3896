// An exact time-domain reference for lossless circuits, by the method of characteristics.
#pragma once
#include "3_model/circuit.h"
#include "4_sim/waveform.h"

namespace rungs::sim {

/// The open-circuit voltage of `drive` at time `t` (s), volts. A step ramps linearly from
/// `low` to `high` starting at `at`, reaching `high` after rise/0.8 (rise is the 10-90 %
/// time; the drive's own, else `settings.rise`). A pulse ramps up the same way, stays high
/// for `width`, ramps down in rise/0.8, and repeats every `period` when one is given. A dc
/// drive is 0 V until `at`, then ramps to `high`. Before `at` a step or pulse is at `low`.
/// Throws std::invalid_argument when no rise time is known, or a pulse has no width.
double drive_voltage(const model::Drive& drive, const model::Settings& settings, double t);

/// Simulates every node of `circuit` from t = 0 to `window` (s) with step `dt` (s): the
/// samples are t = k dt for k = 0, 1, ... while k dt <= window. The nodes are every line end
/// (in the order the lines name them), then any node that only drives and loads touch;
/// ground is not listed, nor the inner nodes of load networks.
///
/// Each lossless line is exact (Bergeron's travelling-wave model) when its delay is a whole
/// multiple of dt; otherwise the delayed history is interpolated linearly between samples,
/// which rounds the corners of an edge by at most a quarter of its change over one step.
/// Loads and source resistances are solved by nodal analysis at every sample, with
/// trapezoidal companion models for L and C (error of order (dt/time constant)^2).
///
/// The circuit starts at rest: before t = 0 every node, capacitor and inductor is at zero
/// and every line uncharged, except a line with `charged`, which starts at that voltage
/// everywhere with zero current. A drive applies its waveform from t = 0, so a step with a
/// `low` other than 0 V jumps to `low` at t = 0. A load with `at` is an ideal switch, open
/// before and closed from the first sample at or after `at`; it is at rest when it closes.
/// A node that no drive or load touches is an open end of the lines reaching it; a line end
/// on ground is a shorted end. A drive with zero source resistance, and a load that is a
/// short, force the node's voltage.
///
/// Throws std::invalid_argument for a line with r or g non-zero (not lossless), a line
/// without a positive z0 and delay, a line delay shorter than dt, dt not positive and finite,
/// window negative or not finite, a drive on ground, a node forced by two zero-resistance
/// sources (or one and a short), a drive without a rise time, or a grid of more than
/// 50 million samples.
Waveforms simulate_characteristics(const model::Circuit& circuit, double window, double dt);

}  // namespace rungs::sim
