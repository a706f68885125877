// Convergence-study arithmetic: observed order of convergence, Richardson extrapolation
// and the grid convergence index (GCI), following Roache's procedure as set out by
// Celik et al. 2008, "Procedure for Estimation and Reporting of Uncertainty Due to
// Discretization in CFD Applications", J. Fluids Eng. 130(7), 078001.
// Standard library only.
#pragma once

#include <limits>
#include <string>
#include <vector>

namespace hearth {

// One level of a study: representative cell size h = (V/N)^(1/3), number of unknowns,
// and the value of the quantity of interest on that level.
struct StudyLevel {
  double h;
  double dofs;
  double value;
};

// monotonic: e32/e21 > 0 and the order equation has a solution p > 0.
// oscillatory: e32/e21 < 0; no order, no extrapolation, no GCI.
// divergent: the differences do not shrink with refinement as any power p > 0 of h
//   would make them: e32/e21 <= ln r32 / ln r21 (with equal ratios |e21| >= |e32|).
// converged_exactly: the differences are round-off (relative 1e-10, what linear solves
//   to hearth's default tolerance resolve); GCI 0, no order.
// too_few_levels: fewer than three levels, so no observed order. With two levels the
//   extrapolation and the fine GCI use the supplied formal order and a factor of
//   safety of 3; with fewer than two, everything is NaN.
enum class ConvergenceKind { monotonic, oscillatory, divergent, converged_exactly, too_few_levels };

// Whether the levels are in the asymptotic range, judged by the observed orders of the
// two finest triplets of levels (levels n-4..n-2 and n-3..n-1): a sequence in that range
// follows one power of h, so both triplets give the same order (Roache, Verification and
// Validation in Computational Science and Engineering, 1998, on several grid triplets;
// from memory). Celik's ratio of the two GCIs (asymptotic_ratio) is kept as a figure but
// not used: it equals phi1/phi2 for a pure power law and so reads about 1 for any
// sequence whose values change little, in the range or not.
//   not_checked: fewer than four levels, or the finest triplet has no order.
//   asymptotic: both triplets monotonic, orders within triplet_order_tolerance.
//   not_asymptotic: the orders differ by more, or the coarser triplet is not monotonic.
enum class AsymptoticRange { not_checked, asymptotic, not_asymptotic };

struct ConvergenceEstimate {
  ConvergenceKind kind = ConvergenceKind::too_few_levels;
  // p from the three finest levels (fixed-point iteration for unequal ratios, bisection
  // where that iteration is unstable), in (0, 10]; capped at 10 (status says so).
  double observed_order = std::numeric_limits<double>::quiet_NaN();
  // Richardson value from the two finest levels, (r21^p phi1 - phi2) / (r21^p - 1).
  double extrapolated = std::numeric_limits<double>::quiet_NaN();
  // Relative (0.022 for 2.2 %), with safety_factor: Fs |(phi1 - phi2)/phi1| / (r21^p - 1).
  double gci_fine = std::numeric_limits<double>::quiet_NaN();
  // The same for the middle/coarse pair: Fs |(phi2 - phi3)/phi2| / (r32^p - 1).
  double gci_medium = std::numeric_limits<double>::quiet_NaN();
  // Celik's indicator gci_medium / (r21^p gci_fine): about 1 in the asymptotic range,
  // but also outside it (exactly phi1/phi2 for a pure power law, because each GCI is
  // relative to its own finer value); reported, not used for asymptotic_range.
  double asymptotic_ratio = std::numeric_limits<double>::quiet_NaN();
  // 1.25 with three or more levels, 3 with two (NaN with fewer).
  double safety_factor = std::numeric_limits<double>::quiet_NaN();
  // Observed order of each triplet of consecutive levels, coarsest triplet first (levels
  // k, k+1, k+2 for k = 0 .. n-3); NaN where a triplet is not monotonic. The last entry
  // is observed_order. Empty with fewer than three levels.
  std::vector<double> triplet_orders;
  AsymptoticRange asymptotic_range = AsymptoticRange::not_checked;
  // plain words, e.g. "monotonic, asymptotic (triplet orders 1.98, 2.00)", "oscillatory: no order"
  std::string status;
};

// The two finest triplet orders agree when |p_fine - p_coarser| <= this * p_fine
// (a project choice, common practice, no source).
inline constexpr double triplet_order_tolerance = 0.1;

// levels ordered coarse to fine (any number; the three finest are used); formal_order
// (> 0) is used when there are only two levels. Throws std::invalid_argument when h is
// not positive and strictly decreasing, a value is not finite, or (two levels) the
// formal order is not positive.
ConvergenceEstimate estimate_convergence(const std::vector<StudyLevel>& levels, double formal_order);

const char* to_string(ConvergenceKind kind);
const char* to_string(AsymptoticRange range);  // "not_checked", "asymptotic", "not_asymptotic"

}  // namespace hearth
