// How far a circuit's ladder waveforms stand from the exact ones: the error, delay and overshoot.
#pragma once
#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/frequency_reference.h"
#include "4_sim/two_port.h"

namespace rungs::sim {

/// One waveform pair compared over a window, for one source.
struct WaveformError {
  /// The largest |v_ladder(t) - v_exact(t)| over the samples, divided by |swing|.
  double error = 0.0;
  double at = 0.0;  // s, where that largest difference falls
  /// s: the ladder's 50 %-crossing time minus the exact one's, on the exact waveform's first
  /// edge: the level is half the change (from the value at t = 0) at which that edge ends, where
  /// its slope falls under 5 % of its steepest; a crossing is the first sample pair that passes
  /// the level (interpolated linearly). The first edge, not the final value, so that a wave that
  /// climbs in steps (a matched source's near end: half, then all of it when the open end's
  /// reflection returns) gives its arrival, not a point on a plateau. Empty when that change is
  /// under 1 % of the swing, or when the ladder's waveform never crosses the level.
  std::optional<double> delay_error;
  /// The ladder's peak change minus the exact one's, in the direction of the exact waveform's
  /// largest change, divided by |swing|: positive when the ladder overshoots further. Both
  /// settle to the same DC value, so this is the difference of their overshoots.
  double overshoot_error = 0.0;
};

/// Compares two waveforms sampled on the same grid t (s). Needs equal, non-empty sizes and a
/// non-zero swing (V); throws std::invalid_argument otherwise.
WaveformError compare_waveforms(std::span<const double> t, std::span<const double> exact,
                                std::span<const double> ladder, double swing);

/// The comparison at one line end: the worst over the sources that reach it.
struct EndError {
  std::size_t line = 0;  // into circuit.lines
  bool far = false;      // the far end (else the near end)
  std::string node;
  std::size_t source = 0;  // into Response::sources: the source with the largest error here
  /// The largest error over sources, with its time; the delay and overshoot errors of largest
  /// magnitude over sources (see WaveformError).
  WaveformError worst;
  /// Estimated error of `worst.error` itself: the largest |e_K - e_{K/2}| over the window of the
  /// difference e = v_ladder - v_exact (the inversion's truncation), over |swing|.
  double error_estimate = 0.0;
};

struct LadderMeasurement {
  std::vector<EndError> ends;       // the near then far end of each line; ends on ground left out
  std::vector<double> line_errors;  // per circuit line: the larger error of its two ends
  double error = 0.0;               // the largest of all ends
  /// Estimated error of the figures: the largest end error estimate, plus the aliasing bounds of both
  /// responses. A planner may trust `error` to within this.
  double error_estimate = 0.0;
  Response ladder;  // the ladder circuit's waveforms, on the exact reference's grid
};

/// The waveform error of replacing every line k by ladders[k] (parallel to circuit.lines), under
/// the circuit's own drives, loads, switches and charges, against `exact` (from exact_reference
/// with the same circuit and options). The ladder circuit is solved on exact.grid, so both share
/// one truncation and the comparison costs one frequency sweep (one per closed switch more).
/// Sources with zero swing are left out. A workspace (frequency_response) saves rebuilding the
/// FFT plans from one call to the next. Throws std::invalid_argument when `ladders` does not
/// match the lines or `exact` is not of this circuit.
LadderMeasurement measure_ladder_error(const model::Circuit& circuit, const Response& exact,
                                 const std::vector<LadderSpec>& ladders,
                                 const ReferenceOptions& options,
                                 ResponseWorkspace* workspace = nullptr);

}  // namespace rungs::sim
