/* The exact CPML reflection evaluation in plain C as issue 13 measured it: the
 * reference of the kernel goal ("the same evaluation in C"). The same inputs
 * and result as the TypeScript kernel (physics.md section 3), in the steps the
 * TypeScript took when the issue was filed: coefficients per node with three
 * pow calls (Roden & Gedney 2000), F per node at one frequency, the shooting
 * recurrence dividing by F, and the split from k_x = 2 asin(sqrt(x)).
 * bench/kernel.c is the same evaluation with every later optimisation of the
 * TypeScript kernel ported to C as well (shown beside it, without a goal).
 * The loops are written so that gcc -O3 vectorises what IEEE arithmetic
 * allows: the grading and node-factor arithmetic in straight loops over
 * arrays; pow and exp stay scalar libm calls (gcc vectorises them only with
 * -ffast-math, which would change the arithmetic), and the recurrence carries
 * its state from one layer to the next.
 * Usage: kernel-reference LAYERS SECONDS  -> runs for SECONDS of CPU time, prints
 * evaluations per CPU second and a checksum. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

#define MAXN 256
static double eB[MAXN + 1], eA[MAXN + 1], eK[MAXN + 1], hB[MAXN], hA[MAXN], hK[MAXN];
static double eRe_[MAXN + 1], eIm_[MAXN + 1], hRe_[MAXN], hIm_[MAXN];
static double gS[MAXN + 1], gK[MAXN + 1], gA[MAXN + 1], gE[MAXN + 1];

/* Grading of n nodes at (i + offset) / N: sigma, kappa, alpha, with three pow calls per node as
 * src/physics/grading.ts makes them (the reference work of the kernel goal; scalar libm calls). */
static void grade(int n, double offset, int N, double m, double smax, double kmax, double amax, double ma) {
  for (int i = 0; i < n; i++) {
    double u = (i + offset) / N;
    gS[i] = smax * pow(u, m);
    gK[i] = 1 + (kmax - 1) * pow(u, m);
    gA[i] = amax * pow(1 - u, ma);
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

static void fill(int N, double m, double strength, double kmax, double amax, double ma, double sm) {
  double smax = strength * 0.8 * (m + 1);
  grade(N + 1, 0, N, m, smax, kmax, amax, ma);
  nodes(N + 1, sm, eB, eA, eK);
  grade(N, 0.5, N, m, smax, kmax, amax, ma);
  nodes(N, sm, hB, hA, hK);
}

static void factors(int N, double wdt) {
  double c = cos(wdt), s = sin(wdt);
  for (int i = 0; i <= N; i++) {
    double p = 1 - eB[i] * c, q = eB[i] * s, den = p * p + q * q;
    eRe_[i] = eK[i] + eA[i] * p / den;
    eIm_[i] = -eA[i] * q / den;
  }
  for (int i = 0; i < N; i++) {
    double p = 1 - hB[i] * c, q = hB[i] * s, den = p * p + q * q;
    hRe_[i] = hK[i] + hA[i] * p / den;
    hIm_[i] = -hA[i] * q / den;
  }
}

static double kernel(int N, double sm, double wdt, double skt2, double *im_out) {
  double sh = sin(wdt / 2), om = 2 * sh / sm, zeta = 1 - 4 * skt2 / (om * om), wz = om * zeta;
  double er = 0, ei = 0, hr = 1, hi = 0;
  for (int i = N - 1; i >= 0; i--) {
    double fr = hRe_[i], fi = hIm_[i], den = fr * fr + fi * fi;
    double tr = (hr * fr + hi * fi) / den, ti = (hi * fr - hr * fi) / den;
    er += om * ti;
    ei -= om * tr;
    fr = eRe_[i]; fi = eIm_[i]; den = fr * fr + fi * fi;
    tr = (er * fr + ei * fi) / den; ti = (ei * fr - er * fi) / den;
    hr += wz * ti;
    hi -= wz * tr;
    double mag = fabs(er) + fabs(ei) + fabs(hr) + fabs(hi);
    if (mag > 1e150) { er *= 1e-150; ei *= 1e-150; hr *= 1e-150; hi *= 1e-150; }
  }
  double e1r = er + om * hi, e1i = ei - om * hr;
  double x = sh * sh / (sm * sm) - skt2, kx = 2 * asin(sqrt(x)), ck = cos(kx), sk = sin(kx);
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
      double im, re = kernel(N, sm, wdt, 0, &im);
      checksum += re * re + im * im;
      count++;
    }
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t1);
    elapsed = (t1.tv_sec - t0.tv_sec) + 1e-9 * (t1.tv_nsec - t0.tv_nsec);
  }
  printf("%.6e %.17g\n", count / elapsed, sqrt(checksum / count));
  return 0;
}
