// Internal to the extremes module: lanes of doubles through the GCC/Clang vector extension and
// the vector exp and log the batch rate sum uses (rate_sum_kernel.cpp), in a header of their own
// so that a benchmark can set them beside a vector-math library (docs/design.md, "What stays
// hand-written"). Included inside a namespace, after the includer's target and contraction
// pragmas, so it opens no namespace itself; the includer brings <cstdint>, <cstring> and <cmath>.
#pragma once

#define TIDEWRIGHT_INLINE inline __attribute__((always_inline))

template <int Bytes>
struct Lanes {
  typedef double Vd __attribute__((vector_size(Bytes)));
  typedef std::uint64_t Vu __attribute__((vector_size(Bytes)));
  typedef std::int64_t Vm __attribute__((vector_size(Bytes)));
  static constexpr std::size_t count = Bytes / sizeof(double);
};

template <class To, class From>
TIDEWRIGHT_INLINE To reinterpret(const From& from) {
  static_assert(sizeof(To) == sizeof(From));
  To to;
  std::memcpy(&to, &from, sizeof to);
  return to;
}
template <class V>
TIDEWRIGHT_INLINE V splat(double x) {
  return V{} + x;
}
// mask ? a : b, lane by lane (mask lanes all ones or all zeros, as comparisons give them).
template <class M, class V>
TIDEWRIGHT_INLINE V select(const M& mask, const V& a, const V& b) {
  return reinterpret<V>((mask & reinterpret<M>(a)) | (~mask & reinterpret<M>(b)));
}

// ln t for normal t > 0: t = 2^k m with m in [sqrt(2)/2, sqrt(2)), then the polynomial in
// s = (m - 1)/(m + 1) of fdlibm's e_log.c (Sun Microsystems 1993; error below 1 ulp).
template <class L>
TIDEWRIGHT_INLINE typename L::Vd vector_log(const typename L::Vd& t) {
  using Vd = typename L::Vd;
  using Vu = typename L::Vu;
  constexpr std::uint64_t sqrt_half_bits = 0x3fe6a09e667f3bcdULL;
  const Vu bits = reinterpret<Vu>(t);
  const Vu biased_k = (bits - sqrt_half_bits + (0x3ffULL << 52U)) >> 52U;  // k + 1023, logical shift
  const Vd m = reinterpret<Vd>(bits - ((biased_k - 0x3ffULL) << 52U));
  // k + 1023 placed in the mantissa of 2^52, then 2^52 + 1023 taken off: k as a double.
  const Vd k = reinterpret<Vd>(biased_k | 0x4330000000000000ULL) - (0x1p52 + 1023.0);
  const Vd f = m - 1.0;
  const Vd hfsq = 0.5 * f * f;
  const Vd s = f / (2.0 + f);
  const Vd z = s * s;
  const Vd w = z * z;
  const Vd t1 = w * (3.999999999940941908e-01 + w * (2.222219843214978396e-01 + w * 1.531383769920937332e-01));
  const Vd t2 = z * (6.666666666666735130e-01 +
                     w * (2.857142874366239149e-01 + w * (1.818357216161805012e-01 + w * 1.479819860511658591e-01)));
  const Vd r = t2 + t1;
  constexpr double ln2_hi = 6.93147180369123816490e-01;  // fdlibm's split of ln 2
  constexpr double ln2_lo = 1.90821492927058770002e-10;
  return k * ln2_hi - ((hfsq - (s * (hfsq + r) + k * ln2_lo)) - f);
}

// e^x: x = k ln2 + r with |r| <= ln2/2 (Cody & Waite 1980 reduction, fdlibm's split of ln 2),
// e^r by its Taylor polynomial of degree 13 (truncation below 5e-18 relative), times 2^k built
// in two factors so that results down to the smallest subnormal come out right.
template <class L>
TIDEWRIGHT_INLINE typename L::Vd vector_exp(const typename L::Vd& x_in) {
  using Vd = typename L::Vd;
  using Vu = typename L::Vu;
  const Vd lo = splat<Vd>(-746.0);  // below: 0; above 710: +inf
  const Vd hi = splat<Vd>(710.0);
  Vd x = select(x_in < lo, lo, x_in);
  x = select(x > hi, hi, x);
  constexpr double shifter = 0x1.8p52;  // adding it rounds to an integer kept in the low bits
  Vd kd = x * 1.44269504088896338700e+00 + shifter;
  const Vu kbits = reinterpret<Vu>(kd);
  kd = kd - shifter;
  const Vd r = (x - kd * 6.93147180369123816490e-01) - kd * 1.90821492927058770002e-10;
  // Estrin's scheme (pairs, then powers r^2, r^4, r^8): a short chain of dependent operations.
  const Vd r2 = r * r;
  const Vd r4 = r2 * r2;
  const Vd r8 = r4 * r4;
  const Vd q0 = 1.0 + r;
  const Vd q1 = 1.0 / 2.0 + r * (1.0 / 6.0);
  const Vd q2 = 1.0 / 24.0 + r * (1.0 / 120.0);
  const Vd q3 = 1.0 / 720.0 + r * (1.0 / 5040.0);
  const Vd q4 = 1.0 / 40320.0 + r * (1.0 / 362880.0);
  const Vd q5 = 1.0 / 3628800.0 + r * (1.0 / 39916800.0);
  const Vd q6 = 1.0 / 479001600.0 + r * (1.0 / 6227020800.0);
  const Vd p = (q0 + q1 * r2 + (q2 + q3 * r2) * r4) + ((q4 + q5 * r2) + q6 * r4) * r8;
  const Vu kb = kbits - 0x4338000000000000ULL + 2048ULL;        // k + 2048 >= 0
  const Vu half = kb >> 1U;                                     // floor(k/2) + 1024
  const Vd scale1 = reinterpret<Vd>((half - 1ULL) << 52U);      // 2^floor(k/2)
  const Vd scale2 = reinterpret<Vd>((kb - half - 1ULL) << 52U); // 2^(k - floor(k/2))
  return p * scale1 * scale2;
}

