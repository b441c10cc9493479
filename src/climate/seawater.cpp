// Glossary: see include/tidewright/climate/seawater.hpp.
//
// The 75 coefficients below are those of Roquet et al. (2015), as distributed in the Gibbs
// SeaWater (GSW) Oceanographic Toolbox of TEOS-10 (GSW-C, gsw_internal_const.h, v_ijk), which
// carries this notice:
//   Copyright (c) 2011, SCOR/IAPSO WG127 (Scientific Committee on Oceanic Research/
//   International Association for the Physical Sciences of the Oceans, Working Group 127).
//   All rights reserved. Redistribution and use, in source and binary forms, without
//   modification, is permitted provided that the copyright notice, the conditions and the
//   disclaimer are retained (full text: http://www.TEOS-10.org). THIS SOFTWARE IS PROVIDED BY
//   THE COPYRIGHT HOLDERS AND CONTRIBUTORS "AS IS" AND ANY EXPRESS OR IMPLIED WARRANTIES ARE
//   DISCLAIMED.
// The evaluation (a term table and its analytic temperature derivative) is this project's own.
#include "tidewright/climate/seawater.hpp"

#include <array>
#include <cmath>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::climate {

namespace {

// Roquet et al. (2015) scaled variables: x = sqrt(sfac S_A + offset), y = Theta / 40,
// z = p / 10^4, with sfac = 1/(40 u_PS), u_PS = 35.16504/35 g/kg, offset = 24 sfac.
constexpr double salinity_factor = 0.0248826675584615;
constexpr double salinity_offset = 5.971840214030754e-1;
constexpr double temperature_scale = 0.025;  // 1 / 40 K
constexpr double pressure_scale = 1e-4;      // 1 / 10^4 dbar

struct Term {
  int t_power;  // power of y (temperature)
  int s_power;  // power of x (square root of scaled salinity)
  int p_power;  // power of z (pressure)
  double coefficient_m3_kg;
};

// v = sum c y^i x^j z^k (Roquet et al. 2015, eq. for the 75-term specific volume).
constexpr std::array<Term, 75> terms{{
    {0, 0, 0, 1.0769995862e-3},
    {0, 0, 1, -6.0799143809e-5},
    {0, 0, 2, 9.9856169219e-6},
    {0, 0, 3, -1.1309361437e-6},
    {0, 0, 4, 1.0531153080e-7},
    {0, 0, 5, -1.2647261286e-8},
    {0, 0, 6, 1.9613503930e-9},
    {0, 1, 0, -3.1038981976e-4},
    {0, 1, 1, 2.4262468747e-5},
    {0, 1, 2, -5.8484432984e-7},
    {0, 1, 3, 3.6310188515e-7},
    {0, 1, 4, -1.1147125423e-7},
    {0, 2, 0, 6.6928067038e-4},
    {0, 2, 1, -3.4792460974e-5},
    {0, 2, 2, -4.8122251597e-6},
    {0, 2, 3, 1.6746303780e-8},
    {0, 3, 0, -8.5047933937e-4},
    {0, 3, 1, 3.7470777305e-5},
    {0, 3, 2, 4.9263106998e-6},
    {0, 4, 0, 5.8086069943e-4},
    {0, 4, 1, -1.7322218612e-5},
    {0, 4, 2, -1.7811974727e-6},
    {0, 5, 0, -2.1092370507e-4},
    {0, 5, 1, 3.0927427253e-6},
    {0, 6, 0, 3.1932457305e-5},
    {1, 0, 0, -1.5649734675e-5},
    {1, 0, 1, 1.8505765429e-5},
    {1, 0, 2, -1.1736386731e-6},
    {1, 0, 3, -3.6527006553e-7},
    {1, 0, 4, 3.1454099902e-7},
    {1, 1, 0, 3.5009599764e-5},
    {1, 1, 1, -9.5677088156e-6},
    {1, 1, 2, -5.5699154557e-6},
    {1, 1, 3, -2.7295696237e-7},
    {1, 2, 0, -4.3592678561e-5},
    {1, 2, 1, 1.1100834765e-5},
    {1, 2, 2, 5.4620748834e-6},
    {1, 3, 0, 3.4532461828e-5},
    {1, 3, 1, -9.8447117844e-6},
    {1, 3, 2, -1.3544185627e-6},
    {1, 4, 0, -1.1959409788e-5},
    {1, 4, 1, 2.5909225260e-6},
    {1, 5, 0, 1.3864594581e-6},
    {2, 0, 0, 2.7762106484e-5},
    {2, 0, 1, -1.1716606853e-5},
    {2, 0, 2, 2.1305028740e-6},
    {2, 0, 3, 2.8695905159e-7},
    {2, 1, 0, -3.7435842344e-5},
    {2, 1, 1, -2.3678308361e-7},
    {2, 1, 2, 3.9137387080e-7},
    {2, 2, 0, 3.5907822760e-5},
    {2, 2, 1, 2.9283346295e-6},
    {2, 2, 2, -6.5731104067e-7},
    {2, 3, 0, -1.8698584187e-5},
    {2, 3, 1, -4.8826139200e-7},
    {2, 4, 0, 3.8595339244e-6},
    {3, 0, 0, -1.6521159259e-5},
    {3, 0, 1, 7.9279656173e-6},
    {3, 0, 2, -4.6132540037e-7},
    {3, 1, 0, 2.4141479483e-5},
    {3, 1, 1, -3.4558773655e-6},
    {3, 1, 2, 7.7618888092e-9},
    {3, 2, 0, -1.4353633048e-5},
    {3, 2, 1, 3.1655306078e-7},
    {3, 3, 0, 2.2863324556e-6},
    {4, 0, 0, 6.9111322702e-6},
    {4, 0, 1, -3.4102187482e-6},
    {4, 0, 2, -6.3352916514e-8},
    {4, 1, 0, -8.7595873154e-6},
    {4, 1, 1, 1.2956717783e-6},
    {4, 2, 0, 4.3703680598e-6},
    {5, 0, 0, -8.0539615540e-7},
    {5, 0, 1, 5.0736766814e-7},
    {5, 1, 0, -3.3052758900e-7},
    {6, 0, 0, 2.0543094268e-7},
}};

struct Scaled {
  std::array<double, 8> y_pow{};
  std::array<double, 8> x_pow{};
  std::array<double, 8> z_pow{};
};

Scaled scale(double sa, double ct, double p) {
  if (!std::isfinite(sa) || !std::isfinite(ct) || !std::isfinite(p) || sa < 0.0 || p < 0.0) {
    throw InputError("seawater state", "needs finite S_A >= 0 g/kg, Theta and p >= 0 dbar",
                     "give Absolute Salinity, Conservative Temperature and sea pressure");
  }
  Scaled s;
  const double x = std::sqrt(salinity_factor * sa + salinity_offset);
  const double y = ct * temperature_scale;
  const double z = p * pressure_scale;
  s.y_pow[0] = s.x_pow[0] = s.z_pow[0] = 1.0;
  for (std::size_t i = 1; i < 8; ++i) {
    s.y_pow[i] = s.y_pow[i - 1] * y;
    s.x_pow[i] = s.x_pow[i - 1] * x;
    s.z_pow[i] = s.z_pow[i - 1] * z;
  }
  return s;
}

double volume(const Scaled& s) {
  double v = 0.0;
  for (const Term& t : terms) {
    v += t.coefficient_m3_kg * s.y_pow[static_cast<std::size_t>(t.t_power)] *
         s.x_pow[static_cast<std::size_t>(t.s_power)] * s.z_pow[static_cast<std::size_t>(t.p_power)];
  }
  return v;
}

}  // namespace

double specific_volume_m3_kg(double absolute_salinity_g_kg, double conservative_temperature_c, double sea_pressure_dbar) {
  return volume(scale(absolute_salinity_g_kg, conservative_temperature_c, sea_pressure_dbar));
}

double thermal_expansion_per_k(double absolute_salinity_g_kg, double conservative_temperature_c, double sea_pressure_dbar) {
  const Scaled s = scale(absolute_salinity_g_kg, conservative_temperature_c, sea_pressure_dbar);
  // alpha = (1/v) dv/dTheta; dv/dTheta = (1/40) sum i c y^(i-1) x^j z^k (derivative of the
  // polynomial term by term).
  double dv_dy = 0.0;
  for (const Term& t : terms) {
    if (t.t_power == 0) continue;
    dv_dy += t.t_power * t.coefficient_m3_kg * s.y_pow[static_cast<std::size_t>(t.t_power - 1)] *
             s.x_pow[static_cast<std::size_t>(t.s_power)] * s.z_pow[static_cast<std::size_t>(t.p_power)];
  }
  return temperature_scale * dv_dy / volume(s);
}

}  // namespace tidewright::climate
