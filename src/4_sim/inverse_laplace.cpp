// Damped Fourier-series inversion of Laplace transforms (Dubner & Abate 1968; Crump 1976) by FFT.
#include "4_sim/inverse_laplace.h"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <stdexcept>

#include <unsupported/Eigen/FFT>

#include "4_sim/two_port.h"

namespace rungs::sim {

namespace {

/// (1 - e^{-z})/z, the mean of e^{-zu} over 0 <= u <= 1.
Complex mean_exp(Complex z) {
  if (std::abs(z) < 0.5) {
    // Taylor series sum (-z)^n/(n+1)!: the closed form cancels here.
    Complex term = 1.0;
    Complex sum = 1.0;
    for (int n = 1; n < 18; ++n) {
      term *= -z / static_cast<double>(n + 1);
      sum += term;
    }
    return sum;
  }
  return -expm1(-z) / z;
}

/// (1 - e^{-z}(1 + z))/z^2 = the integral of u e^{-zu} over 0 <= u <= 1.
Complex first_moment_exp(Complex z) {
  if (std::abs(z) < 0.5) {
    // sum (-z)^n / (n! (n + 2)).
    Complex power = 1.0;
    Complex sum = 0.5;
    for (int n = 1; n < 18; ++n) {
      power *= -z / static_cast<double>(n);
      sum += power / static_cast<double>(n + 2);
    }
    return sum;
  }
  return (-expm1(-z) - z * std::exp(-z)) / (z * z);
}

}  // namespace

struct LaplaceInverter::Fft {
  Eigen::FFT<double> fft;
};

Complex LaplaceGrid::s(std::size_t k) const {
  return {sigma, 2.0 * std::numbers::pi * static_cast<double>(k) / period};
}

double LaplaceGrid::aliasing() const {
  return std::exp(-sigma * period);
}

LaplaceGrid make_laplace_grid(double window, std::size_t frequencies, double aliasing,
                              std::size_t oversample) {
  if (!(window > 0.0) || !std::isfinite(window))
    throw std::invalid_argument("the inversion window must be positive and finite");
  if (!(aliasing > 0.0 && aliasing < 1.0))
    throw std::invalid_argument("the aliasing factor must lie between 0 and 1");
  if (frequencies < 1 || oversample < 1)
    throw std::invalid_argument("the inversion needs at least one frequency and one sample");
  LaplaceGrid grid;
  grid.period = 2.0 * window;
  grid.sigma = std::log(1.0 / aliasing) / grid.period;
  grid.frequencies = frequencies;
  grid.oversample = oversample;
  return grid;
}

LaplaceInverter::LaplaceInverter(const LaplaceGrid& grid)
    : grid_(grid), fft_(std::make_unique<Fft>()) {
  fft_->fft.SetFlag(Eigen::FFT<double>::Unscaled);
  fft_->fft.SetFlag(Eigen::FFT<double>::HalfSpectrum);
  const std::size_t m = grid.fft_size();
  growth_.resize(m);
  // e^{sigma t_j} by repeated products, restarted from exp every 64 samples so that rounding
  // cannot accumulate past a few units in the last place.
  const double h = grid.time_step();
  const double factor = std::exp(grid.sigma * h);
  for (std::size_t j = 0; j < m; ++j)
    growth_[j] =
        j % 64 == 0 ? std::exp(grid.sigma * h * static_cast<double>(j)) : growth_[j - 1] * factor;
  half_.resize(m / 2 + 1);
  real_.resize(m);
}

LaplaceInverter::~LaplaceInverter() = default;

void LaplaceInverter::damped(std::span<const Complex> spectrum, std::size_t used,
                             std::vector<double>& g) {
  const std::size_t m = grid_.fft_size();
  used = std::min({used, spectrum.size(), grid_.frequencies});
  // The real inverse FFT sums X_0 + 2 Re sum_{k>0} X_k e^{i 2 pi k j / M} over the half
  // spectrum: the series of the header, cut after `used` terms. The 1/P is applied to the
  // `used` terms rather than to the M samples, and only what an earlier call left past them
  // is cleared (the rest of the half spectrum stays zero from one call to the next).
  const double scale = 1.0 / grid_.period;
  for (std::size_t k = 0; k < used; ++k) half_[k] = scale * spectrum[k];
  if (nonzero_ > used)
    std::fill(half_.begin() + static_cast<std::ptrdiff_t>(used),
              half_.begin() + static_cast<std::ptrdiff_t>(nonzero_), Complex(0.0, 0.0));
  nonzero_ = used;
  half_[0] = half_[0].real();
  g.resize(m);
  fft_->fft.inv(g.data(), half_.data(), static_cast<Eigen::DenseIndex>(m));
}

void LaplaceInverter::undamp(std::span<const double> g, std::span<double> out) const {
  const std::size_t n = std::min({out.size(), g.size(), growth_.size()});
  for (std::size_t j = 0; j < n; ++j) out[j] = growth_[j] * g[j];
}

void LaplaceInverter::transform_until(std::span<const double> g, double cut,
                                      std::vector<Complex>& out) {
  const std::size_t m = grid_.fft_size();
  const double h = grid_.time_step();
  const std::size_t kmax = grid_.frequencies;
  out.assign(kmax, Complex(0.0, 0.0));
  if (!(cut > 0.0)) return;
  // The linear interpolant of the samples is a sum of hats g_j T((t - t_j)/h), and a hat's
  // transform is h sinc^2(w h / 2) e^{-i w t_j}: the sum over j is one forward FFT. Hats cut at
  // the ends of the interval are corrected one by one below.
  const std::size_t last_full = std::min(m - 2, static_cast<std::size_t>(cut / h));
  std::fill(real_.begin(), real_.end(), 0.0);
  for (std::size_t j = 0; j <= last_full && j < g.size(); ++j) real_[j] = g[j];
  fft_->fft.fwd(half_.data(), real_.data(), static_cast<Eigen::DenseIndex>(m));
  nonzero_ = half_.size();
  const double dw = 2.0 * std::numbers::pi / grid_.period;
  const double tm = h * static_cast<double>(last_full);
  const double delta = cut - tm;  // the part of the last interval before the cut
  const double g_m = g[last_full];
  const double g_next = last_full + 1 < g.size() ? g[last_full + 1] : 0.0;
  for (std::size_t k = 0; k < kmax; ++k) {
    const double w = dw * static_cast<double>(k);
    const double x = w * h;
    const double sinc = x == 0.0 ? 1.0 : std::sin(0.5 * x) / (0.5 * x);
    // right(x) = integral_0^1 (1 - u) e^{-ixu} du, the transform of a hat's right half; its
    // left half is the conjugate.
    const Complex ix(0.0, x);
    const Complex right = mean_exp(ix) - first_moment_exp(ix);
    Complex e = h * sinc * sinc * half_[k] - real_[0] * h * std::conj(right);
    // Replace the last hat's right half by the interpolant from t_m to the cut.
    const Complex rotate = std::exp(Complex(0.0, -w * tm));
    e -= g_m * rotate * h * right;
    const Complex iwd(0.0, w * delta);
    e += rotate * (g_m * delta * mean_exp(iwd) +
                   (g_next - g_m) / h * delta * delta * first_moment_exp(iwd));
    out[k] = e;
  }
}

}  // namespace rungs::sim
