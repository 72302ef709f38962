/* Plain-C baseline of the exact CPML reflection evaluation (physics.md §3):
 * coefficients per node (Roden & Gedney 2000), inverse node factors 1/F at one
 * frequency, the sample's constants, and the shooting recurrence from the
 * conductor. Same steps, same arithmetic, same order as src/physics/cpml.ts +
 * reflection.ts (issue 13's kernel: whole grading orders by repeated squaring
 * instead of pow, alpha's power skipped when alpha_max = 0, one complex
 * division per node for 1/F and none in the recurrence, the split's cos/sin
 * of the x-wavenumber from sin^2(kx/2) by square roots, the two divisions by kappa
 * skipped where kappa = 1 and alpha = 0), for `npm run bench`.
 * The loops are written so that gcc -O3 vectorises what IEEE arithmetic
 * allows: the grading and node-factor arithmetic in straight loops over
 * arrays; pow and exp stay scalar libm calls (gcc vectorises them only with
 * -ffast-math, which would change the arithmetic), and the recurrence carries
 * its state from one layer to the next.
 * Usage: kernel LAYERS SECONDS  -> runs for SECONDS of CPU time, prints
 * evaluations per CPU second and a checksum. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define MAXN 256
static double eB[MAXN + 1], eA[MAXN + 1], eK[MAXN + 1], hB[MAXN], hA[MAXN], hK[MAXN];
static double eRe_[MAXN + 1], eIm_[MAXN + 1], hRe_[MAXN], hIm_[MAXN];
static double gS[MAXN + 1], gK[MAXN + 1], gA[MAXN + 1], gE[MAXN + 1];

/* x^n for a whole n >= 0 by repeated squaring (src/physics/grading.ts powWhole). */
static inline double pow_whole(double x, int n) {
  double r = 1, p = x;
  for (;;) {
    if (n & 1) r *= p;
    n >>= 1;
    if (n == 0) return r;
    p *= p;
  }
}

/* Grading of n nodes at (i + offset) / N: sigma, kappa, alpha as src/physics/cpml.ts sampleNodes
 * makes them: u^m once per node, by pow_whole for a whole order (pow otherwise); alpha's power
 * only when alpha_max > 0. */
static void grade(int n, double offset, int N, double m, double smax, double kmax, double amax, double ma) {
  int mw = m == (int)m, maw = ma == (int)ma;
  for (int i = 0; i < n; i++) {
    double u = fmin((i + offset) / N, 1);
    double um = mw ? pow_whole(u, (int)m) : pow(u, m);
    gS[i] = smax * um;
    gK[i] = 1 + (kmax - 1) * um;
    gA[i] = amax == 0 ? 0 : amax * (maw ? pow_whole(1 - u, (int)ma) : pow(1 - u, ma));
  }
}

/* Node coefficients b = exp(-(sigma/kappa + alpha) dt), a, 1/kappa of the graded nodes. */
static void nodes(int n, double sm, double *restrict b, double *restrict a, double *restrict kinv) {
  for (int i = 0; i < n; i++) gE[i] = -(gS[i] / gK[i] + gA[i]) * sm; /* vectorised */
  for (int i = 0; i < n; i++) b[i] = exp(gE[i]);                     /* libm, scalar */
  for (int i = 0; i < n; i++) {                                     /* vectorised */
    double sigma = gS[i], kappa = gK[i], den = sigma * kappa + kappa * kappa * gA[i];
    a[i] = (sigma > 0 && den > 0) ? sigma * (b[i] - 1) / den : 0;
    kinv[i] = 1 / kappa;
  }
}

/* kappa = 1 and alpha = 0 on every node (src/physics/cpml.ts sampleNodes' fast path): sigma/kappa = sigma,
 * sigma kappa + kappa^2 alpha = sigma and 1/kappa = 1 exactly, so two divisions per node fewer. */
static void nodes_plain(int n, int N, double offset, int m, double smax, double sm, double *restrict b, double *restrict a,
                        double *restrict kinv) {
  for (int i = 0; i < n; i++) {
    double u = i + offset < N ? (i + offset) / N : 1;
    a[i] = smax * pow_whole(u, m);
  }
  for (int i = 0; i < n; i++) b[i] = exp(-a[i] * sm);
  for (int i = 0; i < n; i++) {
    double sigma = a[i];
    a[i] = sigma > 0 ? sigma * (b[i] - 1) / sigma : 0;
    kinv[i] = 1;
  }
}

static void fill(int N, double m, double strength, double kmax, double amax, double ma, double sm) {
  double smax = strength * (0.8 * (m + 1));
  if (kmax == 1 && amax == 0 && m == (int)m) {
    nodes_plain(N + 1, N, 0, (int)m, smax, sm, eB, eA, eK);
    nodes_plain(N, N, 0.5, (int)m, smax, sm, hB, hA, hK);
    return;
  }
  grade(N + 1, 0, N, m, smax, kmax, amax, ma);
  nodes(N + 1, sm, eB, eA, eK);
  grade(N, 0.5, N, m, smax, kmax, amax, ma);
  nodes(N, sm, hB, hA, hK);
}

/* 1/F = w/(w/kappa + a), w = 1 - b e^{-j wdt}: one complex division per node. */
static void invert(int n, double c, double s, const double *restrict b, const double *restrict a, const double *restrict k,
                   double *restrict re, double *restrict im) {
  for (int i = 0; i < n; i++) {
    double p = 1 - b[i] * c, q = b[i] * s, dr = k[i] * p + a[i], di = k[i] * q, dd = dr * dr + di * di;
    re[i] = (p * dr + q * di) / dd;
    im[i] = (q * dr - p * di) / dd;
  }
}

static void factors(int N, double wdt) {
  double c = cos(wdt), s = sin(wdt);
  invert(N + 1, c, s, eB, eA, eK, eRe_, eIm_);
  invert(N, c, s, hB, hA, hK, hRe_, hIm_);
}

/* The sample's constants (src/physics/reflection.ts fillSample, propagating wave):
 * Omega, Omega*zeta, cos kx = 1 - 2x, sin kx = 2 sqrt(x(1 - x)), x = sin^2(kx/2). */
static double S_om, S_wz, S_ck, S_sk;
static void sample(double sm, double wdt, double skt2) {
  double sh = sin(wdt / 2), om = 2 * sh / sm, zeta = 1 - 4 * skt2 / (om * om);
  double x = sh * sh / (sm * sm) - skt2;
  S_om = om;
  S_wz = om * zeta;
  S_ck = 1 - 2 * x;
  S_sk = 2 * sqrt(x * (1 - x));
}

static double kernel(int N, double *im_out) {
  double om = S_om, wz = S_wz;
  double er = 0, ei = 0, hr = 1, hi = 0;
  for (int i = N - 1; i >= 0; i--) {
    double gr = hRe_[i], gi = hIm_[i];
    double tr = hr * gr - hi * gi, ti = hr * gi + hi * gr;
    er += om * ti;
    ei -= om * tr;
    gr = eRe_[i]; gi = eIm_[i];
    tr = er * gr - ei * gi; ti = er * gi + ei * gr;
    hr += wz * ti;
    hi -= wz * tr;
    double mag = fabs(er) + fabs(ei) + fabs(hr) + fabs(hi);
    if (mag > 1e150) { er *= 1e-150; ei *= 1e-150; hr *= 1e-150; hi *= 1e-150; }
  }
  double e1r = er + om * hi, e1i = ei - om * hr, ck = S_ck, sk = S_sk;
  double nr = er * ck - ei * sk - e1r, ni = er * sk + ei * ck - e1i;
  double dr = e1r - (er * ck + ei * sk), di = e1i - (ei * ck - er * sk), dd = dr * dr + di * di;
  *im_out = (ni * dr - nr * di) / dd;
  return (nr * dr + ni * di) / dd;
}

int main(int argc, char **argv) {
  int N = argc > 1 ? atoi(argv[1]) : 12;
  double seconds = argc > 2 ? atof(argv[2]) : 1.0;
  double sm = 0.99 / sqrt(3.0), checksum = 0;
  long count = 0;
  struct timespec t0, t1;
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t0);
  double elapsed = 0;
  while (elapsed < seconds) {
    for (int k = 0; k < 1000; k++) {
      /* vary the strength slightly so nothing can be hoisted out of the loop */
      double strength = 1 + 1e-9 * (double)(count & 1023);
      fill(N, 3, strength, 1, 0, 1, sm);
      double wdt = 2 * M_PI * sm / 20;
      factors(N, wdt);
      sample(sm, wdt, 0);
      double im, re = kernel(N, &im);
      checksum += re * re + im * im;
      count++;
    }
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t1);
    elapsed = (t1.tv_sec - t0.tv_sec) + 1e-9 * (t1.tv_nsec - t0.tv_nsec);
  }
  printf("%.6e %.17g\n", count / elapsed, sqrt(checksum / count));
  return 0;
}
