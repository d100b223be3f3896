// The exact time-domain reference: the frequency-domain nodal solution of a circuit brought to the
// time domain by the damped-FFT inverse Laplace transform, with its own error estimated.
#pragma once
#include <complex>
#include <cstddef>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "3_model/circuit.h"
#include "4_sim/excitation.h"
#include "4_sim/inverse_laplace.h"
#include "4_sim/two_port.h"
#include "4_sim/waveform.h"

namespace rungs::sim {

struct ReferenceOptions {
  double window = 0.0;  // s, observed from t = 0; must be positive
  /// The error the reference may carry, as a fraction of each source's swing. The estimate it is
  /// held to (ReferenceErrorEstimate) is about the error, not a bound with a margin: a planner that
  /// must keep the reference under a tenth of its tolerance should ask for a twentieth.
  double target = 1e-3;
  InitialState initial = InitialState::automatic;
  /// s, parallel to circuit.loads: the closing time of each switched load, over which the
  /// switch's voltage falls linearly from its open value to zero (compensation_source in the
  /// .cpp; the deck's switch does the same). Missing or 0: the switch closes at once, as an
  /// ideal switch and the method of characteristics do.
  std::vector<double> closing;
  std::size_t min_frequencies = 256;
  std::size_t max_frequencies = std::size_t{1} << 17;
  std::size_t oversample = 2;
};

/// How far the reference may stand from the true waveforms, as fractions of the swing of the
/// source that causes them (the largest over sources and nodes).
struct ReferenceErrorEstimate {
  /// Estimated truncation error: the largest |v_K(t) - v_{K/2}(t)| over the window, between the
  /// inversion with all K frequencies and with the lower half. The truncation error of a
  /// waveform with corners falls as 1/K, so this is about the error of v_K itself (within a
  /// factor of about 1.5 either way on the cases of the tests).
  double truncation = 0.0;
  /// Bound of the aliasing term, e^{-sigma P}/(1 - e^{-sigma P}) times twice the largest
  /// |v| seen (the waveform beyond the window is not seen; twice is a margin).
  double aliasing = 0.0;
  double estimate() const { return truncation + aliasing; }
  bool within_target = false;
};

/// Node voltages on one time grid, kept apart by source.
struct Response {
  LaplaceGrid grid;
  std::vector<double> t;  // t_j = j grid.time_step(), for t_j <= window
  std::vector<std::string> nodes;
  std::vector<Excitation> excitations;
  std::vector<Switch> switches;
  /// V, per switch that closes inside the window (in closing order): its open voltage at the
  /// moment it closes, all sources together.
  std::vector<double> switch_voltages;
  InitialState initial = InitialState::settled;
  /// v[source][node][j], V: the voltage each source causes, its steady part included.
  std::vector<std::vector<std::vector<double>>> v;
  /// The same from the lower half of the frequencies, at every other sample (t_{2j}): the
  /// truncation estimate's partner.
  std::vector<std::vector<std::vector<double>>> coarse;
  ReferenceErrorEstimate error_estimate;

  /// The node voltages of all sources together.
  Waveforms total() const;
  /// The index of `node` in `nodes`, or none.
  std::optional<std::size_t> node_index(const std::string& node) const;
};

/// FFT plans and buffers kept from one response to the next on the same grid: building a plan
/// costs about as much as a sweep of a small circuit, so a planner trying many ladders of one
/// part should pass one workspace to every call. Not safe to share between threads.
class ResponseWorkspace {
 public:
  ResponseWorkspace();
  ~ResponseWorkspace();
  ResponseWorkspace(const ResponseWorkspace&) = delete;
  ResponseWorkspace& operator=(const ResponseWorkspace&) = delete;

  /// The inverters for `grid` and for its lower half, rebuilt when the grid changes.
  LaplaceInverter& fine(const LaplaceGrid& grid);
  LaplaceInverter& coarse(const LaplaceGrid& grid);
  std::vector<std::complex<double>>& spectra() { return spectra_; }

 private:
  std::unique_ptr<LaplaceInverter> fine_;
  std::unique_ptr<LaplaceInverter> coarse_;
  std::vector<std::complex<double>> spectra_;
};

/// The response of `circuit` on `grid`, each line exact or as ladders[k] (empty: all exact).
/// Each source is solved at every s_k; a jump at t = 0 (a charged line's ends, a low level
/// applied at rest) is taken out first as v(0+)/s, v(0+) = lim s V(s) from a solution at a
/// very large real s (the initial-value theorem), and added back exactly, so it does not ring.
/// The switched loads that close within the window are
/// compensated in the order they close: the open-switch voltage before closing comes from the
/// inversion of the previous switch position and is transformed back (transform_until), so each
/// switch costs one more pass over the frequencies. Compensation rather than a piecewise
/// solution: the next piece would start from the voltage and current along every line at the
/// switching time, a function of position that a frequency-domain solution does not carry;
/// compensation keeps one linear time-invariant network per switch position and brings only
/// the switch node's voltage to the time domain and back. Its error is the inversion's, carried
/// once more through that voltage. `options.window` bounds the samples kept.
/// The error estimate is filled in against options.target. Throws what FrequencyNetwork throws, and
/// std::invalid_argument when the window exceeds half the grid's period.
Response frequency_response(const model::Circuit& circuit,
                            const std::vector<std::optional<LadderSpec>>& ladders,
                            const LaplaceGrid& grid, const ReferenceOptions& options,
                            ResponseWorkspace* workspace = nullptr);

/// The exact reference: every line its exact two-port. Starts from a band of 0.1/(target
/// ramp) Hz, with `ramp` the fastest drive's rise/0.8 (about what a corner of an edge doubled at
/// an open end needs), at least min_frequencies, and widens it (1.5 to 8 times at once, as the
/// estimate suggests) until the estimated error meets the target or max_frequencies is reached;
/// error_estimate.within_target says which. The frequency counts are even products of 2, 3 and 5. The
/// aliasing factor is target/100, at most 1e-5. A waveform with a true jump (an ideal switch, a
/// step of zero rise, a charged line discharged at t = 0) cannot meet a small target: its
/// truncation rings (Gibbs) beside the jump.
Response exact_reference(const model::Circuit& circuit, const ReferenceOptions& options,
                         ResponseWorkspace* workspace = nullptr);

/// The smallest even number at least k whose only prime factors are 2, 3 and 5: the FFT of
/// 4k points then runs in radix-2, -3 and -5 passes only.
std::size_t fft_friendly(std::size_t k);

/// The grid exact_reference starts from, for planning the work.
LaplaceGrid initial_reference_grid(const model::Circuit& circuit,
                                   const ReferenceOptions& options);

}  // namespace rungs::sim
