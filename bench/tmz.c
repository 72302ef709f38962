/* Plain-C baseline of the 2-D TMz CPML update of src/physics/fdtd/tmz.ts:
 * the same fused column sweep (H then E per column), periodic in y, CPML along
 * x only (Roden & Gedney 2000), same memory layout. For `npm run bench`.
 * Usage: tmz CELLS NY LAYERS STEPS → prints cell updates per second and a checksum. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

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
  clock_gettime(CLOCK_MONOTONIC, &t0);
  for (int n = 0; n < steps; n++) {
    for (int g = 0; g < G; g++) {
      int r = g * ny, last = r + ny - 1;
      /* H in column g */
      double bb = 0, aa = 0, kk = 1, *psi = NULL;
      int stretched = 0, off = 0;
      if (g < gL) { int i = gL - g - 1; bb = hB[i]; aa = hA[i]; kk = hK[i]; psi = psiHL; off = i * ny - r; stretched = 1; }
      else if (g >= gR) { int i = g - gR; bb = hB[i]; aa = hA[i]; kk = hK[i]; psi = psiHR; off = i * ny - r; stretched = 1; }
      double cur = ez[r];
      if (!stretched) {
        for (int k = r; k < last; k++) { double next = ez[k + 1]; hx[k] -= dt * (next - cur); hy[k] += dt * (ez[k + ny] - cur); cur = next; }
        hx[last] -= dt * (ez[r] - cur); hy[last] += dt * (ez[last + ny] - cur);
      } else {
        for (int k = r; k < last; k++) {
          double next = ez[k + 1]; hx[k] -= dt * (next - cur);
          double d = ez[k + ny] - cur, p = bb * psi[k + off] + aa * d; psi[k + off] = p; hy[k] += dt * (kk * d + p); cur = next;
        }
        hx[last] -= dt * (ez[r] - cur);
        double d = ez[last + ny] - cur, p = bb * psi[last + off] + aa * d; psi[last + off] = p; hy[last] += dt * (kk * d + p);
      }
      if (g == 0) continue;
      /* E in column g */
      stretched = 0;
      if (g <= gL) { int i = gL - g; bb = eB[i]; aa = eA[i]; kk = eK[i]; psi = psiEL; off = i * ny - r; stretched = 1; }
      else if (g >= gR) { int i = g - gR; bb = eB[i]; aa = eA[i]; kk = eK[i]; psi = psiER; off = i * ny - r; stretched = 1; }
      int end = r + ny;
      double prev = hx[end - 1];
      if (!stretched) {
        for (int k = r; k < end; k++) { double h = hx[k]; ez[k] += dt * (hy[k] - hy[k - ny] - (h - prev)); prev = h; }
      } else {
        for (int k = r; k < end; k++) {
          double h = hx[k], d = hy[k] - hy[k - ny], p = bb * psi[k + off] + aa * d; psi[k + off] = p;
          ez[k] += dt * (kk * d + p - (h - prev)); prev = h;
        }
      }
    }
    double t = n - 60.0;
    for (int j = 0; j < ny; j++) ez[src + j] += sin(0.2 * t) * exp(-(t / 20) * (t / 20)) * cos(2 * M_PI * j / ny);
  }
  clock_gettime(CLOCK_MONOTONIC, &t1);
  double el = (t1.tv_sec - t0.tv_sec) + 1e-9 * (t1.tv_nsec - t0.tv_nsec);
  double sum = 0;
  for (long k = 0; k < (long)(G + 1) * ny; k++) sum += ez[k] * ez[k];
  printf("%.6e %.17g\n", (double)(G + 1) * ny * steps / el, sqrt(sum));
  return 0;
}
