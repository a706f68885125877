// Grid convergence index after Celik et al. 2008, J. Fluids Eng. 130(7), 078001
// (fine = 1, medium = 2, coarse = 3).
#include "solver/convergence_study.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <stdexcept>

namespace hearth {
namespace {

// Relative differences below this are "none": solves to the default linear tolerance
// (relative residual 1e-10) leave differences up to about 1e-11 between meshes that all
// reproduce the exact field (measured: a quadratic field on 10-node elements, 2 to 117
// thousand unknowns).
constexpr double round_off = 1e-10;
constexpr double max_order = 10.0;
constexpr int max_iterations = 1000;

std::string format_number(const char* format, double x) {
  char buffer[64];
  std::snprintf(buffer, sizeof buffer, format, x);
  return buffer;
}

void validate(const std::vector<StudyLevel>& levels) {
  for (std::size_t i = 0; i < levels.size(); ++i) {
    const StudyLevel& l = levels[i];
    if (!std::isfinite(l.h) || l.h <= 0)
      throw std::invalid_argument("convergence study: level " + std::to_string(i) + " has a cell size that is not positive");
    if (!std::isfinite(l.value))
      throw std::invalid_argument("convergence study: level " + std::to_string(i) + " has a value that is not finite");
    if (i > 0 && !(l.h < levels[i - 1].h))
      throw std::invalid_argument("convergence study: levels must be ordered coarse to fine (h strictly decreasing)");
  }
}

// Relative difference |a - b| / |fine|; NaN when the finer value is zero.
double relative(double fine, double other) {
  return fine == 0 ? std::numeric_limits<double>::quiet_NaN() : std::abs((fine - other) / fine);
}

// Solves p ln r21 = ln|e32/e21| + ln((r21^p - 1)/(r32^p - 1)) (monotonic case, s = +1)
// by Celik's fixed-point iteration, without the outer absolute value so that a sequence
// whose differences do not shrink gives no positive order instead of a fake one. Where
// the iteration is unstable (r32 much larger than r21), bisection on the same equation
// takes over. Returns false when the equation has no root p > 0 (the differences shrink
// more slowly than any power of h, i.e. e32/e21 <= ln r32 / ln r21); p > 2 max_order
// stands for "above the cap".
bool solve_order(double r21, double r32, double log_ratio, double& p) {
  const double ln21 = std::log(r21), ln32 = std::log(r32);
  auto q = [&](double x) { return std::log(std::expm1(x * ln21) / std::expm1(x * ln32)); };
  if (r21 == r32) {
    p = log_ratio / ln21;
    return p > 0;
  }
  p = log_ratio > 0 ? log_ratio / ln21 : 1.0;
  for (int k = 0; k < max_iterations; ++k) {
    const double next = (log_ratio + q(p)) / ln21;
    if (!std::isfinite(next) || next <= 0) break;
    if (next > 2 * max_order) {
      p = next;
      return true;
    }
    const bool settled = std::abs(next - p) <= 1e-13 * next;
    p = next;
    if (settled) return true;
  }
  // The residual F(p) = p ln r21 - q(p) - ln|e32/e21| increases with p.
  auto residual = [&](double x) { return x * ln21 - q(x) - log_ratio; };
  double lo = 1e-9, hi = 2 * max_order;
  if (!(residual(lo) < 0)) return false;
  if (residual(hi) < 0) {
    p = 2 * hi;
    return true;
  }
  for (int k = 0; k < 200 && hi - lo > 1e-14 * hi; ++k) {
    const double mid = 0.5 * (lo + hi);
    (residual(mid) < 0 ? lo : hi) = mid;
  }
  p = 0.5 * (lo + hi);
  return true;
}

// The classification and order of one triplet: coarse, medium, fine.
struct Triplet {
  ConvergenceKind kind = ConvergenceKind::too_few_levels;
  double order = std::numeric_limits<double>::quiet_NaN();  // monotonic only, at most max_order
  bool capped = false;
  bool fine_pair_zero = false;  // converged_exactly on the two finer levels only
  bool coarse_pair_zero = false;  // the two coarser levels agree, the finest moves away
};

Triplet classify(const StudyLevel& coarse, const StudyLevel& medium, const StudyLevel& fine) {
  Triplet t;
  const double phi1 = fine.value, phi2 = medium.value, phi3 = coarse.value;
  const double e21 = phi2 - phi1, e32 = phi3 - phi2;
  const double scale = std::max({std::abs(phi1), std::abs(phi2), std::abs(phi3)});
  const bool e21_zero = std::abs(e21) <= round_off * scale;
  const bool e32_zero = std::abs(e32) <= round_off * scale;
  if (e21_zero) {
    t.kind = ConvergenceKind::converged_exactly;
    t.fine_pair_zero = !e32_zero;
    return t;
  }
  if (e32_zero) {
    t.kind = ConvergenceKind::divergent;
    t.coarse_pair_zero = true;
    return t;
  }
  if (e32 / e21 < 0) {
    t.kind = ConvergenceKind::oscillatory;
    return t;
  }
  double p = 0;
  if (!solve_order(medium.h / fine.h, coarse.h / medium.h, std::log(std::abs(e32 / e21)), p)) {
    t.kind = ConvergenceKind::divergent;
    return t;
  }
  t.kind = ConvergenceKind::monotonic;
  t.capped = p > max_order;
  t.order = std::min(p, max_order);
  return t;
}

// The asymptotic-range verdict and its words, from the finest triplet (monotonic,
// uncapped) and the one before it (if any).
void judge_asymptotic_range(const std::vector<StudyLevel>& levels, ConvergenceEstimate& e) {
  const std::size_t n = levels.size();
  if (n < 4) {
    e.asymptotic_range = AsymptoticRange::not_checked;
    e.status = "monotonic; asymptotic range not checked (it needs 4 or more levels)";
    return;
  }
  const Triplet before = classify(levels[n - 4], levels[n - 3], levels[n - 2]);
  const double p_fine = e.observed_order;
  if (before.kind != ConvergenceKind::monotonic) {
    e.asymptotic_range = AsymptoticRange::not_asymptotic;
    e.status = std::string("monotonic, not asymptotic (the next coarser triplet is ") +
               (before.kind == ConvergenceKind::converged_exactly ? "converged to round-off" : to_string(before.kind)) +
               ")";
    return;
  }
  const std::string orders =
      format_number("%.3g", before.order) + ", " + format_number("%.3g", p_fine);
  if (!before.capped && std::abs(p_fine - before.order) <= triplet_order_tolerance * p_fine) {
    e.asymptotic_range = AsymptoticRange::asymptotic;
    e.status = "monotonic, asymptotic (triplet orders " + orders + ")";
  } else {
    e.asymptotic_range = AsymptoticRange::not_asymptotic;
    e.status = "monotonic, not asymptotic (triplet orders " + orders + " differ by more than " +
               format_number("%g", 100 * triplet_order_tolerance) + " %)";
  }
}

}  // namespace

const char* to_string(ConvergenceKind kind) {
  switch (kind) {
    case ConvergenceKind::monotonic: return "monotonic";
    case ConvergenceKind::oscillatory: return "oscillatory";
    case ConvergenceKind::divergent: return "divergent";
    case ConvergenceKind::converged_exactly: return "converged_exactly";
    case ConvergenceKind::too_few_levels: return "too_few_levels";
  }
  return "unknown";
}

const char* to_string(AsymptoticRange range) {
  switch (range) {
    case AsymptoticRange::not_checked: return "not_checked";
    case AsymptoticRange::asymptotic: return "asymptotic";
    case AsymptoticRange::not_asymptotic: return "not_asymptotic";
  }
  return "unknown";
}

ConvergenceEstimate estimate_convergence(const std::vector<StudyLevel>& levels, double formal_order) {
  ConvergenceEstimate e;
  validate(levels);
  const std::size_t n = levels.size();
  if (n < 2) {
    e.kind = ConvergenceKind::too_few_levels;
    e.status = "too few levels: at least two are needed";
    return e;
  }

  const StudyLevel& fine = levels[n - 1];
  const StudyLevel& medium = levels[n - 2];
  const double phi1 = fine.value, phi2 = medium.value;
  const double r21 = medium.h / fine.h;
  const double e21 = phi2 - phi1;

  if (n == 2) {
    if (!std::isfinite(formal_order) || formal_order <= 0)
      throw std::invalid_argument("convergence study: two levels need a positive formal order");
    e.safety_factor = 3.0;
    const double scale = std::max(std::abs(phi1), std::abs(phi2));
    if (std::abs(e21) <= round_off * scale) {
      e.kind = ConvergenceKind::converged_exactly;
      e.extrapolated = phi1;
      e.gci_fine = 0;
      e.status = "converged exactly: the two levels agree to round-off";
      return e;
    }
    const double rp = std::pow(r21, formal_order);
    e.kind = ConvergenceKind::too_few_levels;
    e.extrapolated = (rp * phi1 - phi2) / (rp - 1);
    e.gci_fine = e.safety_factor * relative(phi1, phi2) / (rp - 1);
    e.status = "two levels: formal order " + format_number("%g", formal_order) +
               " assumed, factor of safety 3, no observed order";
    return e;
  }

  e.safety_factor = 1.25;
  for (std::size_t k = 0; k + 2 < n; ++k)
    e.triplet_orders.push_back(classify(levels[k], levels[k + 1], levels[k + 2]).order);
  const StudyLevel& coarse = levels[n - 3];
  const double phi3 = coarse.value;
  const double r32 = coarse.h / medium.h;
  const Triplet t = classify(coarse, medium, fine);
  e.kind = t.kind;

  switch (t.kind) {
    case ConvergenceKind::converged_exactly:
      e.extrapolated = phi1;
      e.gci_fine = 0;
      if (t.fine_pair_zero) {
        e.status = "converged exactly on the two finest levels; the coarsest differs";
      } else {
        e.gci_medium = 0;
        e.status = "converged exactly: the levels agree to round-off";
      }
      return e;
    case ConvergenceKind::divergent:
      e.status = t.coarse_pair_zero ? "divergent: the two coarser levels agree and the finest moves away"
                                    : "divergent: differences do not shrink with refinement (no positive order)";
      return e;
    case ConvergenceKind::oscillatory:
      e.status = "oscillatory: no order";
      return e;
    default:
      break;
  }

  const double p = t.order;
  e.observed_order = p;
  const double r21p = std::pow(r21, p), r32p = std::pow(r32, p);
  e.extrapolated = (r21p * phi1 - phi2) / (r21p - 1);
  e.gci_fine = e.safety_factor * relative(phi1, phi2) / (r21p - 1);
  e.gci_medium = e.safety_factor * relative(phi2, phi3) / (r32p - 1);
  e.asymptotic_ratio = e.gci_medium / (r21p * e.gci_fine);

  if (t.capped) {
    e.status = "monotonic, order capped at 10: GCI unreliable";
  } else if (!std::isfinite(e.asymptotic_ratio)) {
    e.status = "monotonic, relative GCI undefined (a level's value is zero)";
  } else {
    judge_asymptotic_range(levels, e);
  }
  return e;
}

}  // namespace hearth
