/* Plain-C baseline of the 2-D TMz CPML update of src/physics/fdtd/tmz.ts:
 * the same fused column sweep (H then E per column), periodic in y, CPML along
 * x only (Roden & Gedney 2000), same memory layout. For `npm run bench`.
 * The inner loops over a column are written so that gcc -O3 vectorises them:
 * differences read from the arrays (no value carried from one cell to the
 * next), the periodic wrap peeled off, and restrict pointers (the fields, the
 * auxiliary ψ arrays and the coefficients never overlap).
 * Usage: tmz CELLS NY LAYERS STEPS  -> prints cell updates per CPU second and a checksum. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

/* H in one column, outside the absorbers: hx -= dt ∂y ez, hy += dt ∂x ez. */
static void h_plain(int ny, double dt, double *restrict hx, double *restrict hy, const double *restrict ez, const double *restrict ezNext) {
  for (int k = 0; k < ny - 1; k++) {
    hx[k] -= dt * (ez[k + 1] - ez[k]);
    hy[k] += dt * (ezNext[k] - ez[k]);
  }
  hx[ny - 1] -= dt * (ez[0] - ez[ny - 1]);
  hy[ny - 1] += dt * (ezNext[ny - 1] - ez[ny - 1]);
}

/* H in one absorber column: hy's x-derivative stretched (1/κ) and convolved (ψ = b ψ + a ∂x ez). */
static void h_cpml(int ny, double dt, double bb, double aa, double kk, double *restrict hx, double *restrict hy, double *restrict psi, const double *restrict ez,
                   const double *restrict ezNext) {
  for (int k = 0; k < ny - 1; k++) {
    hx[k] -= dt * (ez[k + 1] - ez[k]);
    double d = ezNext[k] - ez[k], p = bb * psi[k] + aa * d;
    psi[k] = p;
    hy[k] += dt * (kk * d + p);
  }
  hx[ny - 1] -= dt * (ez[0] - ez[ny - 1]);
  double d = ezNext[ny - 1] - ez[ny - 1], p = bb * psi[ny - 1] + aa * d;
  psi[ny - 1] = p;
  hy[ny - 1] += dt * (kk * d + p);
}

/* E in one column: ez += dt (∂x hy - ∂y hx). */
static void e_plain(int ny, double dt, double *restrict ez, const double *restrict hx, const double *restrict hy, const double *restrict hyPrev) {
  ez[0] += dt * (hy[0] - hyPrev[0] - (hx[0] - hx[ny - 1]));
  for (int k = 1; k < ny; k++) ez[k] += dt * (hy[k] - hyPrev[k] - (hx[k] - hx[k - 1]));
}

static void e_cpml(int ny, double dt, double bb, double aa, double kk, double *restrict ez, double *restrict psi, const double *restrict hx, const double *restrict hy,
                   const double *restrict hyPrev) {
  {
    double d = hy[0] - hyPrev[0], p = bb * psi[0] + aa * d;
    psi[0] = p;
    ez[0] += dt * (kk * d + p - (hx[0] - hx[ny - 1]));
  }
  for (int k = 1; k < ny; k++) {
    double d = hy[k] - hyPrev[k], p = bb * psi[k] + aa * d;
    psi[k] = p;
    ez[k] += dt * (kk * d + p - (hx[k] - hx[k - 1]));
  }
}

int main(int argc, char **argv) {
  int cells = atoi(argv[1]), ny = atoi(argv[2]), N = atoi(argv[3]), steps = atoi(argv[4]);
  double dt = 0.99 / sqrt(2.0) * 0.99;
  int gL = N, gR = N + cells, G = N + cells + N;
  double *ez = calloc((size_t)(G + 1) * ny, sizeof(double));
  double *hx = calloc((size_t)(G + 1) * ny, sizeof(double));
  double *hy = calloc((size_t)G * ny, sizeof(double));
  double *psiEL = calloc((size_t)N * ny, sizeof(double)), *psiHL = calloc((size_t)N * ny, sizeof(double));
  double *psiER = calloc((size_t)N * ny, sizeof(double)), *psiHR = calloc((size_t)N * ny, sizeof(double));
  double *eB = malloc((N + 1) * sizeof(double)), *eA = malloc((N + 1) * sizeof(double)), *eK = malloc((N + 1) * sizeof(double));
  double *hB = malloc(N * sizeof(double)), *hA = malloc(N * sizeof(double)), *hK = malloc(N * sizeof(double));
  for (int i = 0; i <= N; i++) {
    double u = (double)i / N, s = 3.2 * u * u * u, b = exp(-s * dt);
    eB[i] = b; eA[i] = s > 0 ? (b - 1) : 0; eK[i] = 1;
    if (i < N) { u = (i + 0.5) / N; s = 3.2 * u * u * u; b = exp(-s * dt); hB[i] = b; hA[i] = b - 1; hK[i] = 1; }
  }
  int src = (gL + 10) * ny;
  struct timespec t0, t1;
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t0);
  for (int n = 0; n < steps; n++) {
    for (int g = 0; g < G; g++) {
      int r = g * ny;
      /* H in column g */
      if (g < gL) { int i = gL - g - 1; h_cpml(ny, dt, hB[i], hA[i], hK[i], hx + r, hy + r, psiHL + i * ny, ez + r, ez + r + ny); }
      else if (g >= gR) { int i = g - gR; h_cpml(ny, dt, hB[i], hA[i], hK[i], hx + r, hy + r, psiHR + i * ny, ez + r, ez + r + ny); }
      else h_plain(ny, dt, hx + r, hy + r, ez + r, ez + r + ny);
      if (g == 0) continue;
      /* E in column g */
      if (g <= gL) { int i = gL - g; e_cpml(ny, dt, eB[i], eA[i], eK[i], ez + r, psiEL + i * ny, hx + r, hy + r, hy + r - ny); }
      else if (g >= gR) { int i = g - gR; e_cpml(ny, dt, eB[i], eA[i], eK[i], ez + r, psiER + i * ny, hx + r, hy + r, hy + r - ny); }
      else e_plain(ny, dt, ez + r, hx + r, hy + r, hy + r - ny);
    }
    double t = n - 60.0;
    for (int j = 0; j < ny; j++) ez[src + j] += sin(0.2 * t) * exp(-(t / 20) * (t / 20)) * cos(2 * M_PI * j / ny);
  }
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t1);
  double el = (t1.tv_sec - t0.tv_sec) + 1e-9 * (t1.tv_nsec - t0.tv_nsec);
  double sum = 0;
  for (long k = 0; k < (long)(G + 1) * ny; k++) sum += ez[k] * ez[k];
  printf("%.6e %.17g\n", (double)(G + 1) * ny * steps / el, sqrt(sum));
  return 0;
}
