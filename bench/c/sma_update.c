/*
 * Plain C versions of the two SMA integration-point updates of fe-core (Lagoudas 2012 phase
 * fraction model and Souza–Auricchio transformation-strain model), written for the benchmark in
 * bench/material.bench.ts. Same algorithms as the TypeScript (closest-point return map, bracketed
 * scalar solves, consistent tangent), same work per call, so the throughput ratio measures the
 * language/runtime, not the algorithm.
 *
 * usage: sma_update MODEL REGIME COUNT
 *   MODEL  lagoudas2012 | souza-auricchio, REGIME elastic | transforming
 * prints: updates_per_second checksum(σ11 of the reference update) state_checksum
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

static double now_seconds(void) {
  struct timespec ts;
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts); /* CPU time: robust on a shared machine */
  return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* ------------------------------------------------------------------ Lagoudas 2012 */
typedef struct {
  double E_A, E_M, nu, alpha_A, alpha_M, T_ref, Ms0, Mf0, As0, Af0, C_M, C_A, sigma_star;
  double H_min, H_sat, k_t, n1, n2, n3, n4;
  double rhoDs0, D, a1, a2, a3, rhoDu0, Y0, dS, dAlpha, sigmaReg, tolPhi;
} LagParams;

static void lag_calibrate(LagParams *p) {
  double s = p->sigma_star;
  double H = p->H_min + (p->H_sat - p->H_min) * (1 - exp(-p->k_t * s));
  double Hp = (p->H_sat - p->H_min) * p->k_t * exp(-p->k_t * s);
  double Q = H + s * Hp;
  p->dS = 1 / p->E_M - 1 / p->E_A;
  double Qs = Q + s * p->dS;
  p->rhoDs0 = -2 * p->C_M * p->C_A * Qs / (p->C_M + p->C_A);
  p->D = (p->C_M - p->C_A) * Qs / ((p->C_M + p->C_A) * Q);
  p->a1 = p->rhoDs0 * (p->Mf0 - p->Ms0);
  p->a2 = p->rhoDs0 * (p->As0 - p->Af0);
  p->a3 = -p->a1 / 4 * (1 + 1 / (p->n1 + 1) - 1 / (p->n2 + 1)) + p->a2 / 4 * (1 + 1 / (p->n3 + 1) - 1 / (p->n4 + 1));
  p->rhoDu0 = 0.5 * p->rhoDs0 * (p->Ms0 + p->Af0);
  p->Y0 = 0.5 * p->rhoDs0 * (p->Ms0 - p->Af0) - p->a3;
  p->dAlpha = p->alpha_M - p->alpha_A;
  p->sigmaReg = 0.1;
  p->tolPhi = 1e-11 * (p->Y0 + fabs(p->a1) + fabs(p->a2));
}

#define SMOOTH 1e-5
static double pw(double x, double n) {
  if (x <= 0) return 0;
  return n == 1 ? x : x * pow(x + SMOOTH, n - 1);
}
static double pw_slope(double x, double n) {
  if (n == 1) return 1;
  double y = x > 0 ? x : 0;
  return pow(y + SMOOTH, n - 1) + (n - 1) * y * pow(y + SMOOTH, n - 2);
}

typedef struct {
  const LagParams *p;
  double etB[6], etrB[6], xiB, xirB, lamR[6];
  double eps[6], temp;
  double sig[6], lam[6], nhat[6], estar[6], nVec[6], phiS[6], xiN[6], xiPhi[6];
  double sC, aC, bC, denC;
  double psEt[6], psEtr[6], psXi, psXir;
  int failed;
} LagWork;

static double f_fwd(const LagParams *p, double xi) { return 0.5 * p->a1 * (1 + pw(xi, p->n1) - pw(1 - xi, p->n2)) + p->a3; }
static double f_fwd_slope(const LagParams *p, double xi) { return 0.5 * p->a1 * (pw_slope(xi, p->n1) + pw_slope(1 - xi, p->n2)); }
static double f_rev(const LagParams *p, double xi) { return 0.5 * p->a2 * (1 + pw(xi, p->n3) - pw(1 - xi, p->n4)) - p->a3; }
static double f_rev_slope(const LagParams *p, double xi) { return 0.5 * p->a2 * (pw_slope(xi, p->n3) + pw_slope(1 - xi, p->n4)); }

static void known_strain(LagWork *w, double xi) {
  const LagParams *p = w->p;
  double th = (p->alpha_A + xi * p->dAlpha) * (w->temp - p->T_ref);
  for (int i = 0; i < 6; i++) w->estar[i] = w->eps[i] - w->etB[i];
  for (int i = 0; i < 3; i++) w->estar[i] -= th;
}

static double sPs(const LagWork *w) {
  double nu = w->p->nu, tr = w->sig[0] + w->sig[1] + w->sig[2], ss = 0;
  for (int i = 0; i < 6; i++) ss += w->sig[i] * w->sig[i];
  return (1 + nu) * ss - nu * tr * tr;
}

static void build_n(LagWork *w, const double *lam) {
  const LagParams *p = w->p;
  double tr = w->sig[0] + w->sig[1] + w->sig[2], dT = w->temp - p->T_ref;
  for (int i = 0; i < 6; i++) w->nVec[i] = lam[i] + p->dS * (1 + p->nu) * w->sig[i];
  for (int i = 0; i < 3; i++) w->nVec[i] += -p->dS * p->nu * tr + p->dAlpha * dT;
}

static void apply_xi(const LagWork *w, const double *v, double *out) {
  double trv = (v[0] + v[1] + v[2]) / 3, kv = trv / (w->sC * (1 - 2 * w->p->nu)), nv = 0;
  for (int i = 0; i < 6; i++) nv += w->nhat[i] * v[i];
  double c = nv * (1 / w->bC - 1 / w->aC);
  for (int i = 0; i < 6; i++) out[i] = (i < 3 ? v[i] - trv : v[i]) / w->aC + c * w->nhat[i];
  for (int i = 0; i < 3; i++) out[i] += kv;
}

static double eval_forward(LagWork *w, double xi, int deriv) {
  const LagParams *p = w->p;
  double dxi = xi - w->xiB, s = 1 / p->E_A + xi * p->dS;
  w->sC = s;
  known_strain(w, xi);
  double *e = w->estar, tr = e[0] + e[1] + e[2], m = tr / 3, nn = 0;
  for (int i = 0; i < 6; i++) {
    double d = i < 3 ? e[i] - m : e[i];
    w->nhat[i] = d;
    nn += d * d;
  }
  double enorm = sqrt(nn);
  for (int i = 0; i < 6; i++) w->nhat[i] = enorm > 0 ? w->nhat[i] / enorm : 0;
  double c = s * (1 + p->nu), target = sqrt(1.5) * enorm, r2 = p->sigmaReg * p->sigmaReg;
  double x = target / c, lo = 0, hi = x, H = 0, Hp = 0, g = 0, gp = 0;
  int conv = dxi == 0;
  for (int it = 0; it < 100; it++) {
    double ex = p->k_t == 0 ? 1 : exp(-p->k_t * x);
    H = p->H_min + (p->H_sat - p->H_min) * (1 - ex);
    Hp = (p->H_sat - p->H_min) * p->k_t * ex;
    double sr = sqrt(x * x + r2);
    g = x / sr;
    gp = r2 / (sr * sr * sr);
    if (conv) break;
    double psi = c * x + 1.5 * dxi * H * g - target, dpsi = c + 1.5 * dxi * (Hp * g + H * gp);
    if (psi > 0) hi = x; else lo = x;
    if (fabs(psi) <= 1e-15 * target) { conv = 1; continue; }
    double xn = x - psi / dpsi;
    if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi);
    if (fabs(xn - x) <= 1e-15 * (x > 1e-300 ? x : 1e-300)) conv = 1;
    x = xn;
  }
  if (!conv) w->failed = 1;
  double sbar = x;
  w->aC = c + 1.5 * dxi * H / sqrt(sbar * sbar + r2);
  w->bC = c + 1.5 * dxi * (Hp * g + H * gp);
  double dev = sqrt(2.0 / 3.0) * sbar, pm = tr / (3 * s * (1 - 2 * p->nu)), lamMag = sqrt(1.5) * H * g;
  for (int i = 0; i < 6; i++) {
    w->sig[i] = dev * w->nhat[i] + (i < 3 ? pm : 0);
    w->lam[i] = lamMag * w->nhat[i];
  }
  double dT = w->temp - p->T_ref, trs = 3 * pm;
  double phi = (1 - p->D) * H * sbar * g + 0.5 * p->dS * sPs(w) + p->dAlpha * dT * trs + p->rhoDs0 * w->temp - p->rhoDu0 - f_fwd(p, xi) - p->Y0;
  if (!deriv) return phi;
  double dPhiBar = (1 - p->D) * (Hp * sbar * g + H * g + H * sbar * gp) * sqrt(1.5);
  for (int i = 0; i < 6; i++) w->phiS[i] = dPhiBar * w->nhat[i] + p->dS * (1 + p->nu) * w->sig[i];
  for (int i = 0; i < 3; i++) w->phiS[i] += -p->dS * p->nu * trs + p->dAlpha * dT;
  build_n(w, w->lam);
  apply_xi(w, w->nVec, w->xiN);
  double q = 0;
  for (int i = 0; i < 6; i++) q += w->phiS[i] * w->xiN[i];
  w->denC = q + f_fwd_slope(p, xi);
  return phi;
}

static double eval_reverse(LagWork *w, double xi, int deriv) {
  const LagParams *p = w->p;
  double dxi = xi - w->xiB, s = 1 / p->E_A + xi * p->dS;
  w->sC = s;
  double c = s * (1 + p->nu);
  w->aC = w->bC = c;
  known_strain(w, xi);
  double *e = w->estar;
  for (int i = 0; i < 6; i++) e[i] -= dxi * w->lamR[i];
  /* σ' ∥ deviator of the known strain (radial form, as in the TypeScript; no plasticity here) */
  double tr = e[0] + e[1] + e[2], m = tr / 3, nn = 0;
  for (int i = 0; i < 6; i++) {
    double d = i < 3 ? e[i] - m : e[i];
    w->nhat[i] = d;
    nn += d * d;
  }
  double enorm = sqrt(nn);
  for (int i = 0; i < 6; i++) w->nhat[i] = enorm > 0 ? w->nhat[i] / enorm : 0;
  double sbar = sqrt(1.5) * enorm / c, dev = sqrt(2.0 / 3.0) * sbar, pm = tr / (3 * s * (1 - 2 * p->nu));
  for (int i = 0; i < 6; i++) w->sig[i] = dev * w->nhat[i] + (i < 3 ? pm : 0);
  double dT = w->temp - p->T_ref, trs = w->sig[0] + w->sig[1] + w->sig[2], sl = 0;
  for (int i = 0; i < 6; i++) sl += w->sig[i] * w->lamR[i];
  double phi = -(1 + p->D) * sl - 0.5 * p->dS * sPs(w) - p->dAlpha * dT * trs - p->rhoDs0 * w->temp + p->rhoDu0 + f_rev(p, xi) - p->Y0;
  if (!deriv) return phi;
  for (int i = 0; i < 6; i++) w->phiS[i] = -(1 + p->D) * w->lamR[i] - p->dS * (1 + p->nu) * w->sig[i];
  for (int i = 0; i < 3; i++) w->phiS[i] += p->dS * p->nu * trs - p->dAlpha * dT;
  build_n(w, w->lamR);
  apply_xi(w, w->nVec, w->xiN);
  double q = 0;
  for (int i = 0; i < 6; i++) q += w->phiS[i] * w->xiN[i];
  w->denC = q - f_rev_slope(p, xi);
  return phi;
}

static double eval_dir(LagWork *w, int fwd, double xi) { return fwd ? eval_forward(w, xi, 1) : eval_reverse(w, xi, 1); }

static void set_reverse_direction(LagWork *w) {
  double inv = w->xirB > 1e-12 ? 1 / w->xirB : 0;
  for (int i = 0; i < 6; i++) w->lamR[i] = w->etrB[i] * inv;
}

static double solve_fraction(LagWork *w, int fwd) {
  double bound = fwd ? 1 : 0;
  if (eval_dir(w, fwd, bound) >= 0) return bound;
  double pos = w->xiB, neg = bound, x = w->xiB, phi = eval_dir(w, fwd, x);
  for (int it = 0; it < 200; it++) {
    if (phi > 0) pos = x; else neg = x;
    if (fabs(phi) <= w->p->tolPhi) return x;
    if (fabs(pos - neg) <= 1e-15) break;
    double xn = x + phi / w->denC, lo = pos < neg ? pos : neg, hi = pos < neg ? neg : pos;
    if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi);
    x = xn;
    phi = eval_dir(w, fwd, x);
  }
  if (fabs(phi) > 1e3 * w->p->tolPhi && fabs(pos - neg) > 1e-12) w->failed = 1;
  return x;
}

static void commit_phase_end(LagWork *w, double xi, int fwd) {
  double dxi = xi - w->xiB;
  const double *lam = fwd ? w->lam : w->lamR;
  for (int i = 0; i < 6; i++) w->etB[i] += dxi * lam[i];
  w->xiB = xi;
  if (fwd) {
    memcpy(w->etrB, w->etB, sizeof w->etB);
    w->xirB = xi;
  } else if (xi <= 0) {
    w->xiB = 0;
    memset(w->etB, 0, sizeof w->etB);
    memset(w->etrB, 0, sizeof w->etrB);
    w->xirB = 0;
  }
}

static int run_phase(LagWork *w, int fwd) {
  if (!fwd) set_reverse_direction(w);
  memcpy(w->psEt, w->etB, sizeof w->etB);
  memcpy(w->psEtr, w->etrB, sizeof w->etrB);
  w->psXi = w->xiB;
  w->psXir = w->xirB;
  double xi = solve_fraction(w, fwd);
  commit_phase_end(w, xi, fwd);
  return fwd ? xi < 1 : xi > 0;
}

/* state: εᵗ(6), ξ, εᵗʳ(6), ξʳ; returns ok. Not inlined: in an FE code the update is called from
 * the element loop with state read from memory, so the compiler cannot fold the benchmark's
 * constant old state into it. */
__attribute__((noinline)) static int lag_update(LagWork *w, const double *strain, const double *strainOld, double T, double Told,
                      const double *stateOld, double *state, double *stress, double *tangent) {
  const LagParams *p = w->p;
  w->failed = 0;
  memcpy(w->etB, stateOld, 6 * sizeof(double));
  w->xiB = stateOld[6];
  memcpy(w->etrB, stateOld + 7, 6 * sizeof(double));
  w->xirB = stateOld[13];
  memcpy(w->eps, strain, sizeof w->eps);
  w->temp = T;
  double tol = p->tolPhi, pf, pr;
  pf = w->xiB < 1 ? eval_forward(w, w->xiB, 0) : -INFINITY;
  if (w->xiB > 0) { set_reverse_direction(w); pr = eval_reverse(w, w->xiB, 0); } else pr = -INFINITY;
  int mode = -1, transforming = 0; /* -1 elastic, 1 forward, 0 reverse */
  if (pf > tol || pr > tol) {
    int first;
    if (pf > tol && pr > tol) {
      memcpy(w->eps, strainOld, sizeof w->eps);
      w->temp = Told;
      double pf0 = w->xiB < 1 ? eval_forward(w, w->xiB, 0) : -INFINITY, pr0;
      if (w->xiB > 0) { set_reverse_direction(w); pr0 = eval_reverse(w, w->xiB, 0); } else pr0 = -INFINITY;
      memcpy(w->eps, strain, sizeof w->eps);
      w->temp = T;
      first = pf - pf0 >= pr - pr0;
    } else first = pf > tol;
    transforming = run_phase(w, first);
    mode = first;
    int second = !first;
    int allowed = second ? w->xiB < 1 : w->xiB > 0;
    if (allowed) {
      double phi2;
      if (!second) { set_reverse_direction(w); phi2 = eval_reverse(w, w->xiB, 0); } else phi2 = eval_forward(w, w->xiB, 0);
      if (phi2 > tol) { transforming = run_phase(w, second); mode = second; }
    }
    double xi = w->xiB;
    memcpy(w->etB, w->psEt, sizeof w->etB);
    memcpy(w->etrB, w->psEtr, sizeof w->etrB);
    w->xiB = w->psXi;
    w->xirB = w->psXir;
    if (mode == 1) eval_forward(w, xi, 1); else { set_reverse_direction(w); eval_reverse(w, xi, 1); }
    commit_phase_end(w, xi, mode);
  } /* elastic: the trial evaluation (Δξ = 0) already holds stress and the elastic Ξ */
  memcpy(state, w->etB, 6 * sizeof(double));
  state[6] = w->xiB;
  memcpy(state + 7, w->etrB, 6 * sizeof(double));
  state[13] = w->xirB;
  memcpy(stress, w->sig, 6 * sizeof(double));
  double kv = 1 / (3 * w->sC * (1 - 2 * p->nu)), ia = 1 / w->aC, dn = 1 / w->bC - ia;
  for (int i = 0; i < 6; i++)
    for (int j = 0; j < 6; j++) {
      double v = dn * w->nhat[i] * w->nhat[j];
      if (i == j) v += ia;
      if (i < 3 && j < 3) v += kv - ia / 3;
      tangent[i * 6 + j] = v;
    }
  if (mode != -1 && transforming) {
    apply_xi(w, w->phiS, w->xiPhi);
    double inv = 1 / w->denC;
    for (int i = 0; i < 6; i++)
      for (int j = 0; j < 6; j++) tangent[i * 6 + j] -= w->xiN[i] * inv * w->xiPhi[j];
  }
  return !w->failed;
}

/* ------------------------------------------------------------------ Souza–Auricchio */
typedef struct {
  double E, nu, alpha, T_ref, h, beta, T0, R, eps_L, G, K;
  double elastic[36]; /* K 1⊗1 + 2G I_dev, formed once */
} SouzaParams;

typedef struct {
  const SouzaParams *p;
  double e[6], etrN[6], sTr[6], etr[6], v[6], nDir[6], nHat[6], dX[36], jac[64], rhs[48];
  double tau, qNorm, lambda;
  int reg; /* 0 elastic, 1 free, 2 saturated */
  int failed;
} SouzaWork;

static double idev(int i, int j) { return (i == j ? 1.0 : 0.0) - (i < 3 && j < 3 ? 1.0 / 3.0 : 0.0); }

static double souza_trial(SouzaWork *w, double dz) {
  const SouzaParams *p = w->p;
  double lam = dz / (2 * p->G * dz + p->R), vv = 0;
  for (int i = 0; i < 6; i++) {
    double x = w->etrN[i] + lam * w->sTr[i];
    w->v[i] = x;
    vv += x * x;
  }
  double vn = sqrt(vv), q = (vn - lam * w->tau) / (1 + lam * p->h);
  int reg = 1;
  if (q <= 0 || vn == 0) { q = 0; reg = 0; }
  else if (q >= p->eps_L) { q = p->eps_L; reg = 2; }
  double scale = vn > 0 ? q / vn : 0, dd = 0;
  for (int i = 0; i < 6; i++) {
    double x = scale * w->v[i];
    w->etr[i] = x;
    double d = x - w->etrN[i];
    dd += d * d;
  }
  w->reg = reg;
  w->qNorm = q;
  w->lambda = lam;
  return sqrt(dd) / dz - 1;
}

static void souza_solve(SouzaWork *w) {
  double qn = 0;
  for (int i = 0; i < 6; i++) qn += w->etrN[i] * w->etrN[i];
  double upper = sqrt(qn) + w->p->eps_L, a = 1e-12 * upper, fa = souza_trial(w, a), b = upper, fb = souza_trial(w, b);
  if (!(fa > 0) || fb > 0) {
    if (fb > 0) souza_trial(w, b); else souza_trial(w, a);
    return;
  }
  int side = 0;
  for (int it = 0; it < 200; it++) {
    double c = (a * fb - b * fa) / (fb - fa);
    if (!(c > a && c < b)) c = 0.5 * (a + b);
    double fc = souza_trial(w, c);
    if (fabs(fc) <= 1e-14 || b - a <= 1e-15 * upper) return;
    if (fc < 0) { b = c; fb = fc; if (side == -1) fa *= 0.5; side = -1; }
    else { a = c; fa = fc; if (side == 1) fb *= 0.5; side = 1; }
  }
  w->failed = 1;
}

static int solve_dense(double *A, double *B, int n, int m) {
  for (int k = 0; k < n; k++) {
    int piv = k;
    double best = fabs(A[k * n + k]);
    for (int r = k + 1; r < n; r++) if (fabs(A[r * n + k]) > best) { best = fabs(A[r * n + k]); piv = r; }
    if (!(best > 0)) return 0;
    if (piv != k) {
      for (int j = 0; j < n; j++) { double t = A[k * n + j]; A[k * n + j] = A[piv * n + j]; A[piv * n + j] = t; }
      for (int j = 0; j < m; j++) { double t = B[k * m + j]; B[k * m + j] = B[piv * m + j]; B[piv * m + j] = t; }
    }
    double d = A[k * n + k];
    for (int r = k + 1; r < n; r++) {
      double f = A[r * n + k] / d;
      if (f == 0) continue;
      for (int j = k; j < n; j++) A[r * n + j] -= f * A[k * n + j];
      for (int j = 0; j < m; j++) B[r * m + j] -= f * B[k * m + j];
    }
  }
  for (int k = n - 1; k >= 0; k--) {
    double d = A[k * n + k];
    for (int j = 0; j < m; j++) {
      double s = B[k * m + j];
      for (int c = k + 1; c < n; c++) s -= A[k * n + c] * B[c * m + j];
      B[k * m + j] = s / d;
    }
  }
  return 1;
}

static void souza_tangent(SouzaWork *w, double *t) {
  const SouzaParams *p = w->p;
  int sat = w->reg == 2, nu = sat ? 8 : 7;
  double q = w->qNorm, lam = w->lambda, dz = p->R * lam / (1 - 2 * p->G * lam), dd = 0;
  for (int i = 0; i < 6; i++) {
    double d = w->etr[i] - w->etrN[i];
    w->nHat[i] = d;
    dd += d * d;
    w->nDir[i] = w->etr[i] / q;
  }
  double dn = sqrt(dd);
  for (int i = 0; i < 6; i++) w->nHat[i] = dn > 0 ? w->nHat[i] / dn : 0;
  double kappa = w->tau + p->h * q;
  if (sat) {
    double vv = 0;
    for (int i = 0; i < 6; i++) vv += w->v[i] * w->v[i];
    double gam = (sqrt(vv) - p->eps_L) / lam - w->tau - p->h * p->eps_L;
    kappa += gam > 0 ? gam : 0;
  }
  const double *n = w->nDir, *N = w->nHat;
  for (int i = 0; i < 6; i++)
    for (int j = 0; j < 6; j++) {
      double id = idev(i, j);
      w->dX[i * 6 + j] = -2 * p->G * id - p->h * n[i] * n[j] - kappa / q * (id - n[i] * n[j]);
    }
  double *J = w->jac, *B = w->rhs, c = dz / p->R;
  memset(J, 0, sizeof w->jac);
  memset(B, 0, sizeof w->rhs);
  for (int i = 0; i < 6; i++) {
    for (int j = 0; j < 6; j++) {
      double pd = 0;
      for (int k = 0; k < 6; k++) pd += (idev(i, k) - N[i] * N[k]) * w->dX[k * 6 + j];
      J[i * nu + j] = (i == j ? 1 : 0) - c * pd;
      B[i * 6 + j] = c * 2 * p->G * (idev(i, j) - N[i] * N[j]);
    }
    J[i * nu + 6] = -N[i];
    if (sat) {
      double pn = 0;
      for (int k = 0; k < 6; k++) pn += (idev(i, k) - N[i] * N[k]) * n[k];
      J[i * nu + 7] = c * pn;
    }
  }
  for (int j = 0; j < 6; j++) {
    double s = 0;
    for (int k = 0; k < 6; k++) s += N[k] * w->dX[k * 6 + j];
    J[6 * nu + j] = s;
    B[36 + j] = -2 * p->G * N[j];
  }
  if (sat) {
    double nn = 0;
    for (int k = 0; k < 6; k++) nn += N[k] * n[k];
    J[6 * nu + 7] = -nn;
    for (int j = 0; j < 6; j++) J[7 * nu + j] = n[j];
  }
  if (!solve_dense(J, B, nu, 6)) { w->failed = 1; return; }
  for (int i = 0; i < 6; i++)
    for (int j = 0; j < 6; j++) t[i * 6 + j] -= 2 * p->G * B[i * 6 + j];
}

static int souza_transforming(SouzaWork *w, double qn, double ss, double sDotE) {
  const SouzaParams *p = w->p;
  double tolR = 1e-12 * p->R;
  if (qn <= 1e-14 * p->eps_L) return sqrt(ss) > p->R + w->tau + tolR;
  double k0 = w->tau + p->h * qn, sN = sDotE / qn;
  double yy = ss - 2 * k0 * sN + k0 * k0, c = sN - k0;
  if (yy < 0) yy = 0;
  int saturated = qn >= p->eps_L * (1 - 1e-12);
  double xx = saturated && c > 0 ? (yy - c * c > 0 ? yy - c * c : 0) : yy;
  return sqrt(xx) > p->R + tolR;
}

__attribute__((noinline)) static int souza_update(SouzaWork *w, const double *eps, double T, const double *stateOld, double *state, double *stress, double *t) {
  const SouzaParams *p = w->p;
  w->failed = 0;
  w->tau = p->beta * (T - p->T0 > 0 ? T - p->T0 : 0);
  double tr = eps[0] + eps[1] + eps[2], m = tr / 3, qn2 = 0, ss = 0, sn = 0;
  for (int i = 0; i < 6; i++) {
    w->e[i] = i < 3 ? eps[i] - m : eps[i];
    w->etrN[i] = stateOld[i];
    w->sTr[i] = 2 * p->G * (w->e[i] - stateOld[i]);
    qn2 += stateOld[i] * stateOld[i];
    ss += w->sTr[i] * w->sTr[i];
    sn += w->sTr[i] * stateOld[i];
  }
  int tf = souza_transforming(w, sqrt(qn2), ss, sn);
  if (tf) souza_solve(w);
  else { memcpy(w->etr, w->etrN, sizeof w->etr); w->reg = 0; }
  if (w->reg == 0 && tf) memset(w->etr, 0, sizeof w->etr);
  double pr = p->K * (tr - 3 * p->alpha * (T - p->T_ref));
  for (int i = 0; i < 6; i++) {
    stress[i] = 2 * p->G * (w->e[i] - w->etr[i]) + (i < 3 ? pr : 0);
    state[i] = w->etr[i];
  }
  memcpy(t, p->elastic, sizeof p->elastic);
  if (w->reg != 0) souza_tangent(w, t);
  return !w->failed;
}

/* ------------------------------------------------------------------ benchmark driver */
/* Workload shared with bench/material.bench.ts (keep the two in step). */
static const double DIR[6] = {1, -0.35, -0.4, 0.3, 0.1, 0.25};

int main(int argc, char **argv) {
  if (argc < 4) {
    fprintf(stderr, "usage: %s MODEL REGIME COUNT\n", argv[0]);
    return 2;
  }
  const char *model = argv[1];
  int transforming = strcmp(argv[2], "transforming") == 0;
  long count = atol(argv[3]);
  double strain[6], strainOld[6] = {0}, stress[6], tangent[36], state[14], stateOld[14] = {0};
  double sink = 0, ref = 0, refState = 0;
  double t0, t1;
  if (strcmp(model, "lagoudas2012") == 0) {
    LagParams p = {60000, 45000, 0.33, 1.1e-5, 6.6e-6, 20, 10, -5, 15, 30, 7, 7, 300, 0.02, 0.05, 0.01, 1, 1, 1, 1};
    lag_calibrate(&p);
    LagWork w;
    memset(&w, 0, sizeof w);
    w.p = &p;
    double amp = transforming ? 0.02 : 0.001, T = 37;
    for (int i = 0; i < 6; i++) strain[i] = DIR[i] * amp;
    lag_update(&w, strain, strainOld, T, T, stateOld, state, stress, tangent);
    ref = stress[0];
    refState = state[6];
    t0 = now_seconds();
    for (long k = 0; k < count; k++) {
      double f = amp * (1 + 1e-3 * (double)(k % 7));
      for (int i = 0; i < 6; i++) strain[i] = DIR[i] * f;
      if (!lag_update(&w, strain, strainOld, T, T, stateOld, state, stress, tangent)) return 1;
      sink += stress[0] + tangent[7];
    }
    t1 = now_seconds();
  } else {
    SouzaParams p = {50000, 0.3, 0, 20, 1500, 6, 0, 55, 0.05, 0, 0, {0}};
    p.G = p.E / (2 * (1 + p.nu));
    p.K = p.E / (3 * (1 - 2 * p.nu));
    for (int i = 0; i < 6; i++)
      for (int j = 0; j < 6; j++) p.elastic[i * 6 + j] = (i < 3 && j < 3 ? p.K : 0) + 2 * p.G * idev(i, j);
    SouzaWork w;
    memset(&w, 0, sizeof w);
    w.p = &p;
    double amp = transforming ? 0.025 : 0.002, T = 37;
    for (int i = 0; i < 6; i++) strain[i] = DIR[i] * amp;
    souza_update(&w, strain, T, stateOld, state, stress, tangent);
    ref = stress[0];
    refState = state[0];
    t0 = now_seconds();
    for (long k = 0; k < count; k++) {
      double f = amp * (1 + 1e-3 * (double)(k % 7));
      for (int i = 0; i < 6; i++) strain[i] = DIR[i] * f;
      if (!souza_update(&w, strain, T, stateOld, state, stress, tangent)) return 1;
      sink += stress[0] + tangent[7];
    }
    t1 = now_seconds();
  }
  printf("%.6e %.17g %.17g %.6e\n", (double)count / (t1 - t0), ref, refState, sink);
  return 0;
}
