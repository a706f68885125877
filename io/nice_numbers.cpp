// Round spacings of the 1-2-5 series.
#include "io/nice_numbers.hpp"

#include <cmath>
#include <cstdio>

namespace hearth {

namespace {

// A round step as digit * 10^exponent, digit 1, 2 or 5.
struct RoundStep {
  int digit = 1;
  int exponent = 0;
  double value() const { return scaled(1.0); }
  // k steps, computed as (k digit) / 10^-exponent so that 3 x 0.05 prints as 0.15.
  double scaled(double k) const {
    return exponent >= 0 ? k * digit * std::pow(10.0, exponent) : k * digit / std::pow(10.0, -exponent);
  }
};

RoundStep round_step(double rough) {
  int exponent = static_cast<int>(std::floor(std::log10(rough)));
  const double f = rough / std::pow(10.0, exponent);
  int digit = f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10;
  if (digit == 10) digit = 1, ++exponent;
  return {digit, exponent};
}

}  // namespace

std::vector<double> nice_ticks(double low, double high, int count) {
  if (high < low) std::swap(low, high);
  const double span = high - low;
  if (!(span > 1e-12 * std::max(1.0, std::abs(high))) || count < 1) return {low, high};
  const RoundStep step = round_step(span / count);
  const double size = step.value();
  std::vector<double> ticks;
  for (double k = std::ceil(low / size - 1e-9); step.scaled(k) <= high + 1e-9 * size; k += 1.0)
    ticks.push_back(k == 0.0 ? 0.0 : step.scaled(k));
  return ticks;
}

double round_length_below(double at_most) {
  const double decade = std::pow(10.0, std::floor(std::log10(at_most)));
  for (double f : {5.0, 2.0, 1.0})
    if (f * decade <= at_most * (1 + 1e-12)) return f * decade;
  return decade;
}

std::string short_number(double value, int digits) {
  char text[32];
  std::snprintf(text, sizeof text, "%.*g", digits, value);
  return text;
}

}  // namespace hearth
