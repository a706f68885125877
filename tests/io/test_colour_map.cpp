// The pictures' colour map (io/colour_map.hpp) against its published values and the
// property it was chosen for: lightness that rises steadily from cold to hot.
#include <gtest/gtest.h>

#include <cmath>

#include "io/colour_map.hpp"

namespace hearth {
namespace {

// sRGB component to linear light: IEC 61966-2-1 (sRGB), the piecewise transfer function.
double linear(double c) { return c <= 0.04045 ? c / 12.92 : std::pow((c + 0.055) / 1.055, 2.4); }

// CIE 1976 L* of an sRGB colour (D65 white; luminance weights of ITU-R BT.709).
double lightness(const Rgb& c) {
  const double y = 0.2126 * linear(c[0]) + 0.7152 * linear(c[1]) + 0.0722 * linear(c[2]);
  return y > 216.0 / 24389.0 ? 116.0 * std::cbrt(y) - 16.0 : 24389.0 / 27.0 * y;
}

TEST(ColourMap, TableHoldsThePublishedInfernoValues) {
  // Source: matplotlib 3.6.3, lib/matplotlib/_cm_listed.py, _inferno_data rows 0, 64,
  // 128, 192 and 255 (the map of Smith and van der Walt, CC0).
  const auto& t = inferno_table();
  const double rows[5][4] = {{0, 0.001462, 0.000466, 0.013866},
                             {64, 0.341500, 0.062325, 0.429425},
                             {128, 0.735683, 0.215906, 0.330245},
                             {192, 0.978422, 0.557937, 0.034931},
                             {255, 0.988362, 0.998364, 0.644924}};
  for (const auto& row : rows)
    for (int k = 0; k < 3; ++k) EXPECT_DOUBLE_EQ(t[static_cast<std::size_t>(row[0])][k], row[k + 1]) << row[0];
}

TEST(ColourMap, LightnessRisesAtEveryStepSoTheOrderReadsInGrey) {
  // A rainbow map fails this (its lightness goes up and down); the published inferno
  // rises from near black to near white. The figures 0.1 and 97.9 are those of the
  // rows above through the sRGB and CIE L* formulas (computed, not quoted).
  const auto& t = inferno_table();
  for (std::size_t i = 1; i < t.size(); ++i) EXPECT_GT(lightness(t[i]), lightness(t[i - 1])) << "entry " << i;
  EXPECT_NEAR(lightness(t.front()), 0.115, 0.01);
  EXPECT_NEAR(lightness(t.back()), 97.89, 0.01);
}

TEST(ColourMap, FractionsMapOntoTheTableLinearly) {
  const auto& t = inferno_table();
  for (int k = 0; k < 3; ++k) {
    EXPECT_DOUBLE_EQ(inferno_colour(0.0)[k], t[0][k]);
    EXPECT_DOUBLE_EQ(inferno_colour(1.0)[k], t[255][k]);
    EXPECT_DOUBLE_EQ(inferno_colour(-3.0)[k], t[0][k]);  // clamped
    EXPECT_DOUBLE_EQ(inferno_colour(7.0)[k], t[255][k]);
    EXPECT_NEAR(inferno_colour(0.5)[k], (t[127][k] + t[128][k]) / 2, 1e-12);  // 0.5 * 255 = 127.5
  }
}

}  // namespace
}  // namespace hearth
