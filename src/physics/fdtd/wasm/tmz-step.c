/* One leapfrog step of the 2-D TMz CPML grid of ../tmz.ts, compiled to
 * WebAssembly by scripts/build-wasm.sh (the committed tmz-step-wasm.ts holds
 * the bytes; a C compiler is needed only to change this file). Same fused
 * column sweep, same node convention and coefficient indexing as the
 * TypeScript step (Roden & Gedney 2000 recursive-convolution CPML along x,
 * periodic in y). All arrays live in the module's imported linear memory. */

typedef struct {
  int layers;
  const double *eB, *eA, *eK, *hB, *hA, *hK;
  double *psiE, *psiH;
} Side;

static void lossless_h(const double *ez, double *hx, double *hy, int r, int ny, double dt) {
  int last = r + ny - 1;
  double cur = ez[r];
  for (int k = r; k < last; k++) {
    double next = ez[k + 1];
    hx[k] -= dt * (next - cur);
    hy[k] += dt * (ez[k + ny] - cur);
    cur = next;
  }
  hx[last] -= dt * (ez[r] - cur);
  hy[last] += dt * (ez[last + ny] - cur);
}

static void stretched_h(const double *ez, double *hx, double *hy, int r, int ny, double dt, double b, double a, double kinv, double *psi) {
  int last = r + ny - 1;
  double cur = ez[r];
  for (int k = r; k < last; k++) {
    double next = ez[k + 1];
    hx[k] -= dt * (next - cur);
    double d = ez[k + ny] - cur;
    double p = b * psi[k - r] + a * d;
    psi[k - r] = p;
    hy[k] += dt * (kinv * d + p);
    cur = next;
  }
  hx[last] -= dt * (ez[r] - cur);
  double d = ez[last + ny] - cur;
  double p = b * psi[last - r] + a * d;
  psi[last - r] = p;
  hy[last] += dt * (kinv * d + p);
}

static void lossless_e(double *ez, const double *hx, const double *hy, int r, int ny, double dt) {
  int end = r + ny;
  double prev = hx[end - 1];
  for (int k = r; k < end; k++) {
    double h = hx[k];
    ez[k] += dt * (hy[k] - hy[k - ny] - (h - prev));
    prev = h;
  }
}

static void stretched_e(double *ez, const double *hx, const double *hy, int r, int ny, double dt, double b, double a, double kinv, double *psi) {
  int end = r + ny;
  double prev = hx[end - 1];
  for (int k = r; k < end; k++) {
    double h = hx[k];
    double d = hy[k] - hy[k - ny];
    double p = b * psi[k - r] + a * d;
    psi[k - r] = p;
    ez[k] += dt * (kinv * d + p - (h - prev));
    prev = h;
  }
}

/* sides: two Side records (left, right); layers 0 means no absorber on that side. */
__attribute__((export_name("tmz_step")))
void tmz_step(double *ez, double *hx, double *hy, int ny, int G, int gL, int gR, double dt, const Side *sides) {
  const Side *L = &sides[0];
  const Side *R = &sides[1];
  for (int g = 0; g < G; g++) {
    int r = g * ny;
    if (g < gL) {
      int i = gL - g - 1;
      stretched_h(ez, hx, hy, r, ny, dt, L->hB[i], L->hA[i], L->hK[i], L->psiH + i * ny);
    } else if (g < gR) {
      lossless_h(ez, hx, hy, r, ny, dt);
    } else {
      int i = g - gR;
      stretched_h(ez, hx, hy, r, ny, dt, R->hB[i], R->hA[i], R->hK[i], R->psiH + i * ny);
    }
    if (g == 0) continue;
    if (g <= gL) {
      int i = gL - g;
      stretched_e(ez, hx, hy, r, ny, dt, L->eB[i], L->eA[i], L->eK[i], L->psiE + i * ny);
    } else if (g < gR) {
      lossless_e(ez, hx, hy, r, ny, dt);
    } else {
      int i = g - gR;
      stretched_e(ez, hx, hy, r, ny, dt, R->eB[i], R->eA[i], R->eK[i], R->psiE + i * ny);
    }
  }
}
