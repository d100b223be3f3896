// The numerical inverse Laplace transform by a damped Fourier series, summed with an FFT.
//
// Method (the "Fourier series method"; H. Dubner and J. Abate, J. ACM 15(1), 1968, 115-123,
// and K. S. Crump, J. ACM 23(1), 1976, 89-96; citations recalled from memory): for f(t) = 0 at
// t < 0 with transform F(s), the damped function g(t) = e^{-sigma t} f(t) made periodic with
// period P has the Fourier coefficients F(sigma + i 2 pi k / P) / P, so
//   f(t) = e^{sigma t} / P sum_k F(sigma + i 2 pi k / P) e^{i 2 pi k t / P}
//          - sum_{n >= 1} e^{-sigma n P} f(t + n P).
// The second sum (aliasing) is at most e^{-sigma P} / (1 - e^{-sigma P}) max|f|; the first is cut
// after K terms (truncation), whose error an inversion with K/2 terms estimates.
#pragma once
#include <complex>
#include <cstddef>
#include <memory>
#include <span>
#include <vector>

namespace rungs::sim {

/// Where the transform is sampled, s_k = sigma + i 2 pi k / period for k < frequencies, and the
/// time grid it returns, t_j = j period / fft_size().
struct LaplaceGrid {
  double period = 0.0;          // P, s
  double sigma = 0.0;           // damping, 1/s
  std::size_t frequencies = 0;  // K
  std::size_t oversample = 2;   // time samples per half period of the highest frequency, / 2

  std::size_t fft_size() const { return 2 * oversample * frequencies; }
  double time_step() const { return period / static_cast<double>(fft_size()); }
  /// The highest frequency summed, Hz.
  double bandwidth() const { return static_cast<double>(frequencies) / period; }
  std::complex<double> s(std::size_t k) const;
  /// The aliasing factor e^{-sigma P}.
  double aliasing() const;
};

/// The grid for an observation window (s): period = 2 window, so the window is the first half of
/// the period, where the amplification e^{sigma t} of the damping is at most 1/sqrt(aliasing);
/// sigma = ln(1/aliasing)/period. Throws std::invalid_argument unless window > 0,
/// 0 < aliasing < 1 and frequencies, oversample >= 1.
LaplaceGrid make_laplace_grid(double window, std::size_t frequencies, double aliasing,
                              std::size_t oversample = 2);

/// Inverts sampled transforms on one grid; holds the FFT plans and buffers, so one inverter
/// serves many waveforms. Not safe to share between threads.
class LaplaceInverter {
 public:
  explicit LaplaceInverter(const LaplaceGrid& grid);
  ~LaplaceInverter();
  LaplaceInverter(const LaplaceInverter&) = delete;
  LaplaceInverter& operator=(const LaplaceInverter&) = delete;

  const LaplaceGrid& grid() const { return grid_; }

  /// The damped samples g_j = e^{-sigma t_j} f(t_j), j < fft_size(), from F(s_k) for k < `used`
  /// (used <= spectrum.size() and <= frequencies; fewer terms give the coarser truncation that
  /// estimates the error). g_j = (F(s_0) + 2 Re sum_{0<k<used} F(s_k) e^{i 2 pi k j / M}) / P.
  void damped(std::span<const std::complex<double>> spectrum, std::size_t used,
              std::vector<double>& g);

  /// f(t_j) for j < out.size() (at most fft_size()) from damped samples: e^{sigma t_j} g_j.
  void undamp(std::span<const double> g, std::span<double> out) const;

  /// The transform E(s_k), k < frequencies, of f(t) for t < `cut` (0 after), where f is given by
  /// its damped samples, interpolated linearly between them; the cut is exact at any time.
  void transform_until(std::span<const double> g, double cut,
                       std::vector<std::complex<double>>& out);

 private:
  struct Fft;
  LaplaceGrid grid_;
  std::unique_ptr<Fft> fft_;
  std::vector<double> growth_;  // e^{sigma t_j}
  std::vector<std::complex<double>> half_;
  std::size_t nonzero_ = 0;  // half_[k] may be non-zero only for k < nonzero_
  std::vector<double> real_;
};

}  // namespace rungs::sim
