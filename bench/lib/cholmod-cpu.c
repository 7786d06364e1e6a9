/* CPU-time companion of /work/shared/bench/cholmod-ref (same .bin input, same CHOLMOD settings:
 * supernodal, METIS, one thread). On a shared machine the wall clock mostly measures the other
 * tenants; the thread CPU time of each phase is what our own CPU-time figures compare with.
 * Usage: cholmod-cpu FILE.bin REPS  -> one JSON line with min CPU seconds per phase.
 * Build: cc -O2 -o cholmod-cpu cholmod-cpu.c -I/usr/include/suitesparse -lcholmod -lsuitesparseconfig -lm
 */
#include <stdio.h>
#include <stdlib.h>
#include <time.h>
#include "cholmod.h"

static double cpu_seconds(void) {
  struct timespec t;
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &t);
  return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

static double min_of(const double *v, int n) {
  double m = v[0];
  for (int i = 1; i < n; i++) if (v[i] < m) m = v[i];
  return m;
}

int main(int argc, char **argv) {
  if (argc < 3) { fprintf(stderr, "usage: %s FILE.bin REPS\n", argv[0]); return 2; }
  int reps = atoi(argv[2]);
  if (reps < 1) reps = 1;
  if (reps > 32) reps = 32;
  FILE *in = fopen(argv[1], "rb");
  if (!in) { perror(argv[1]); return 1; }
  long head[2];
  if (fread(head, sizeof(long), 2, in) != 2) return 1;
  const long n = head[0], nnz = head[1];
  cholmod_common cm;
  cholmod_l_start(&cm);
  cholmod_sparse *A = cholmod_l_allocate_sparse(n, n, nnz, 1, 1, -1, CHOLMOD_REAL, &cm);
  cholmod_dense *b = cholmod_l_allocate_dense(n, 1, n, CHOLMOD_REAL, &cm);
  size_t ok = fread(A->p, sizeof(long), n + 1, in) == (size_t)(n + 1);
  ok = ok && fread(A->i, sizeof(long), nnz, in) == (size_t)nnz;
  ok = ok && fread(A->x, sizeof(double), nnz, in) == (size_t)nnz;
  ok = ok && fread(b->x, sizeof(double), n, in) == (size_t)n;
  fclose(in);
  if (!ok) { fprintf(stderr, "short read\n"); return 1; }
  cm.supernodal = CHOLMOD_SUPERNODAL;
  cm.nmethods = 1;
  cm.method[0].ordering = CHOLMOD_METIS;
  cm.postorder = 1;
  double ta[32], tf[32], ts[32];
  cholmod_factor *L = NULL;
  for (int r = 0; r < reps; r++) {
    if (L) cholmod_l_free_factor(&L, &cm);
    double t0 = cpu_seconds();
    L = cholmod_l_analyze(A, &cm);
    ta[r] = cpu_seconds() - t0;
  }
  for (int r = 0; r < reps; r++) {
    double t0 = cpu_seconds();
    cholmod_l_factorize(A, L, &cm);
    tf[r] = cpu_seconds() - t0;
  }
  cholmod_dense *x = NULL;
  for (int r = 0; r < reps; r++) {
    if (x) cholmod_l_free_dense(&x, &cm);
    double t0 = cpu_seconds();
    x = cholmod_l_solve(CHOLMOD_A, L, b, &cm);
    ts[r] = cpu_seconds() - t0;
  }
  printf("{\"analyze_cpu\": %.5f, \"factor_cpu\": %.5f, \"solve_cpu\": %.5f}\n", min_of(ta, reps), min_of(tf, reps),
         min_of(ts, reps));
  cholmod_l_free_dense(&x, &cm);
  cholmod_l_free_dense(&b, &cm);
  cholmod_l_free_factor(&L, &cm);
  cholmod_l_free_sparse(&A, &cm);
  cholmod_l_finish(&cm);
  return 0;
}
