// The ladder-against-exact waveform error at every line end, with the 50 % delay and overshoot
// errors.
#include "4_sim/error_measure.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "3_model/circuit.h"

namespace rungs::sim {

namespace {

/// The first time the change `d(j) = v(j) - v(0)` reaches `level` (in the direction of its
/// sign), interpolated linearly between the samples around it.
std::optional<double> first_crossing(std::span<const double> t, std::span<const double> v,
                                     double level) {
  const double sign = level >= 0.0 ? 1.0 : -1.0;
  for (std::size_t j = 1; j < v.size(); ++j) {
    const double d1 = sign * (v[j] - v[0]);
    if (d1 < sign * level) continue;
    const double d0 = sign * (v[j - 1] - v[0]);
    const double f = d1 == d0 ? 0.0 : (sign * level - d0) / (d1 - d0);
    return t[j - 1] + f * (t[j] - t[j - 1]);
  }
  return std::nullopt;
}

/// The change from v[0] at the end of the waveform's first edge in direction `sign`: from where
/// it first passes a tenth of `largest` (its largest change) on while it still climbs at 5 % or
/// more of its steepest slope. A wave that climbs in steps (a reflection adding to the first
/// arrival) thus gives the top of its first step, not of the last.
double first_edge_top(std::span<const double> t, std::span<const double> v, double sign,
                      double largest) {
  double steepest = 0.0;
  for (std::size_t j = 1; j < v.size(); ++j)
    steepest = std::max(steepest, sign * (v[j] - v[j - 1]) / (t[j] - t[j - 1]));
  std::size_t j = 0;
  while (j < v.size() && sign * (v[j] - v[0]) < 0.1 * largest) ++j;
  if (j == v.size()) return 0.0;
  while (j + 1 < v.size() && sign * (v[j + 1] - v[j]) / (t[j + 1] - t[j]) >= 0.05 * steepest) ++j;
  return v[j] - v[0];
}

}  // namespace

WaveformError compare_waveforms(std::span<const double> t, std::span<const double> exact,
                                std::span<const double> ladder, double swing) {
  if (t.empty() || exact.size() != t.size() || ladder.size() != t.size())
    throw std::invalid_argument("the waveforms must share one non-empty grid");
  if (!(std::abs(swing) > 0.0)) throw std::invalid_argument("the swing must not be zero");
  const double scale = 1.0 / std::abs(swing);
  WaveformError w;
  std::size_t peak = 0;
  // The extremes of both changes either way, in the same pass: the direction is known only at
  // the end.
  double exact_up = 0.0, exact_down = 0.0, ladder_up = 0.0, ladder_down = 0.0;
  for (std::size_t j = 0; j < t.size(); ++j) {
    const double e = std::abs(ladder[j] - exact[j]) * scale;
    if (e > w.error) {
      w.error = e;
      w.at = t[j];
    }
    const double de = exact[j] - exact[0];
    const double dl = ladder[j] - ladder[0];
    if (std::abs(de) > std::abs(exact[peak] - exact[0])) peak = j;
    exact_up = std::max(exact_up, de);
    exact_down = std::min(exact_down, de);
    ladder_up = std::max(ladder_up, dl);
    ladder_down = std::min(ladder_down, dl);
  }
  const double change = exact[peak] - exact[0];
  const double sign = change >= 0.0 ? 1.0 : -1.0;
  const double peak_exact = sign > 0.0 ? exact_up : -exact_down;
  const double peak_ladder = sign > 0.0 ? ladder_up : -ladder_down;
  w.overshoot_error = (peak_ladder - peak_exact) * scale;
  const double top = first_edge_top(t, exact, sign, std::abs(change));
  if (std::abs(top) * scale >= 0.01) {
    const std::optional<double> te = first_crossing(t, exact, 0.5 * top);
    const std::optional<double> tl = first_crossing(t, ladder, 0.5 * top);
    if (te && tl) w.delay_error = *tl - *te;
  }
  return w;
}

LadderMeasurement measure_ladder_error(const model::Circuit& circuit, const Response& exact,
                                 const std::vector<LadderSpec>& ladders,
                                 const ReferenceOptions& options, ResponseWorkspace* workspace) {
  if (ladders.size() != circuit.lines.size())
    throw std::invalid_argument("give a ladder for every line");
  std::vector<std::optional<LadderSpec>> choice(ladders.begin(), ladders.end());
  LadderMeasurement out;
  out.ladder = frequency_response(circuit, choice, exact.grid, options, workspace);
  const Response& lad = out.ladder;
  if (lad.nodes != exact.nodes || lad.excitations.size() != exact.excitations.size() ||
      lad.t.size() != exact.t.size())
    throw std::invalid_argument("the exact reference is not of this circuit and window");
  out.line_errors.assign(circuit.lines.size(), 0.0);
  double error_estimate = 0.0;
  for (std::size_t k = 0; k < circuit.lines.size(); ++k) {
    for (const bool far : {false, true}) {
      const std::string& name = far ? circuit.lines[k].far : circuit.lines[k].near;
      if (model::is_ground(name)) continue;
      const std::optional<std::size_t> i = exact.node_index(name);
      if (!i) throw std::invalid_argument("the exact reference is not of this circuit");
      EndError end;
      end.line = k;
      end.far = far;
      end.node = name;
      bool any = false;
      for (std::size_t c = 0; c < exact.excitations.size(); ++c) {
        const double swing = exact.excitations[c].swing;
        if (!(std::abs(swing) > 0.0)) continue;
        const WaveformError w = compare_waveforms(exact.t, exact.v[c][*i], lad.v[c][*i], swing);
        if (!any || w.error > end.worst.error) {
          end.worst.error = w.error;
          end.worst.at = w.at;
          end.source = c;
        }
        if (w.delay_error &&
            (!end.worst.delay_error || std::abs(*w.delay_error) > std::abs(*end.worst.delay_error)))
          end.worst.delay_error = w.delay_error;
        if (!any || std::abs(w.overshoot_error) > std::abs(end.worst.overshoot_error))
          end.worst.overshoot_error = w.overshoot_error;
        any = true;
        // The difference's own truncation: e_K - e_{K/2}, from both responses' halves.
        double trunc = 0.0;
        for (std::size_t j = 0; j < exact.coarse[c][*i].size(); ++j) {
          const double fine = lad.v[c][*i][2 * j] - exact.v[c][*i][2 * j];
          const double coarse = lad.coarse[c][*i][j] - exact.coarse[c][*i][j];
          trunc = std::max(trunc, std::abs(fine - coarse));
        }
        end.error_estimate = std::max(end.error_estimate, trunc / std::abs(swing));
      }
      out.line_errors[k] = std::max(out.line_errors[k], end.worst.error);
      out.error = std::max(out.error, end.worst.error);
      error_estimate = std::max(error_estimate, end.error_estimate);
      out.ends.push_back(std::move(end));
    }
  }
  out.error_estimate = error_estimate + exact.error_estimate.aliasing + lad.error_estimate.aliasing;
  return out;
}

}  // namespace rungs::sim
