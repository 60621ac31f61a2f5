// Direct log pair sums Σ log|x_i − x_j|² on the CPU's own vector units, a Node-API addon built at
// install time by scripts/build-native.mjs with the machine's C compiler. It complements the
// WebAssembly kernels (pairs.ts), whose 128-bit lanes cap the speed: the same products-of-distances
// method on 512-bit (AVX-512) or 256-bit (AVX2) lanes, chosen at run time, with a scalar path for
// other CPUs, and the rows split over threads by the caller's blocks.
//
//   logPairBlocks(x, y, z, bounds, threads[, isa]) → Float64Array
//     x, y, z   coordinates per axis (Float64Array of length n; z null in the plane)
//     bounds    row boundaries 0 = a_0 < … < a_K = n (Int32Array)
//     returns   for each block k, Σ_{a_k ≤ i < a_{k+1}} Σ_{j > i} log|x_i − x_j|², each block summed
//               by itself (so any number of threads gives the same values to the bit)
//     throws    an Error with fields i, j when two points coincide (the first such pair of the first
//               block that has one)
//     isa       optional: 'avx2' or 'scalar' to use a narrower kernel than the CPU's widest (tests)
//   isa() → 'avx512' | 'avx2' | 'scalar', the widest kernel this CPU runs
//
// Sums of logarithms are compensated (Neumaier, Z. Angew. Math. Mech. 54, 1974; Higham, Accuracy and
// Stability of Numerical Algorithms, 2002, §4.3). Squared distances are formed as dx·dx + dy·dy (+ dz·dz)
// without fused multiply-adds (the build passes -ffp-contract=off), as in the WebAssembly kernels.
#include <node_api.h>
#include <math.h>
#include <pthread.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#define LOW 1e-150
#define HIGH 1e150
#define SAFE_COORD 1e34
#define MAXW 8

// ---------------------------------------------------------------- the vector kernels

#pragma GCC push_options
#pragma GCC target("avx512f")
#define QF_W 8
#define QF_VD vd8
#define QF_VI vi8
#define QF_LOAD load8
#define QF_SPLAT splat8
#define QF_FOUR four_avx512
#include "pairs-rows.h"
#pragma GCC pop_options

#pragma GCC push_options
#pragma GCC target("avx2")
#define QF_W 4
#define QF_VD vd4
#define QF_VI vi4
#define QF_LOAD load4
#define QF_SPLAT splat4
#define QF_FOUR four_avx2
#include "pairs-rows.h"
#pragma GCC pop_options

typedef int (*four_fn)(const double *, const double *, const double *, int, int, double *, int64_t *);

/* The widest kernel this CPU runs, or the one asked for ("avx512", "avx2", "scalar") when it runs it. */
static four_fn pick_four(const char *want, int *width, const char **name) {
  __builtin_cpu_init();
  int w512 = __builtin_cpu_supports("avx512f"), w256 = __builtin_cpu_supports("avx2");
  if (want && strcmp(want, "scalar") == 0) w512 = w256 = 0;
  if (want && strcmp(want, "avx2") == 0) w512 = 0;
  if (w512) {
    *width = 8;
    *name = "avx512";
    return four_avx512;
  }
  if (w256) {
    *width = 4;
    *name = "avx2";
    return four_avx2;
  }
  *width = 0;
  *name = "scalar";
  return NULL;
}

// ---------------------------------------------------------------- careful scalar path

typedef struct {
  double s, c;
} acc_t;

static inline void acc_add(acc_t *a, double x) {
  double t = a->s + x;
  if (fabs(a->s) >= fabs(x)) a->c += (a->s - t) + x;
  else a->c += (x - t) + a->s;
  a->s = t;
}

typedef struct {
  const double *x, *y, *z;
  int n;
  int fast;
  four_fn four;
  int width;
} points_t;

static inline double r2_at(const points_t *P, int i, int j) {
  double dx = P->x[i] - P->x[j], dy = P->y[i] - P->y[j];
  double r = dx * dx + dy * dy;
  if (P->z) {
    double dz = P->z[i] - P->z[j];
    r += dz * dz;
  }
  return r;
}

/* Row r against the columns [j0, j1) by a running product checked after every factor (a lone factor
   outside [1e−150, 1e150] is logged by itself); 0 with the pair in *bi, *bj at a zero distance. */
static int row_careful(const points_t *P, int r, int j0, int j1, acc_t *acc, int *bi, int *bj) {
  double prod = 1;
  for (int j = j0; j < j1; j++) {
    double q = r2_at(P, r, j);
    if (q == 0) {
      *bi = r;
      *bj = j;
      return 0;
    }
    if (q < LOW || q > HIGH) {
      acc_add(acc, log(q));
      continue;
    }
    prod *= q;
    if (prod < LOW || prod > HIGH) {
      acc_add(acc, log(prod));
      prod = 1;
    }
  }
  if (prod != 1) acc_add(acc, log(prod));
  return 1;
}

// ln 2 = LN2 + LN2_REST (the double nearest ln 2 and the remainder, from a 50-digit decimal ln 2)
#define LN2 0.6931471805599453
#define LN2_REST 2.3190468138462996e-17

/* One block of rows [a, b): Σ_{a ≤ i < b} Σ_{j > i} log r²_ij; 0 with the pair at a zero distance. */
static int block_sum(const points_t *P, int a, int b, double *out, int *bi, int *bj) {
  const int n = P->n, W = P->width;
  acc_t acc = { 0, 0 };
  double p[4 * MAXW];
  int64_t e[4 * MAXW];
  for (int k = 0; k < 4 * MAXW; k++) {
    p[k] = 1;
    e[k] = 0;
  }
  int i = a;
  if (P->four) {
    for (; i + 4 <= b; i += 4) {
      // the small triangle inside the four rows
      for (int r = i; r < i + 3; r++) {
        if (!row_careful(P, r, r + 1, i + 4, &acc, bi, bj)) return 0;
      }
      if (i + 4 >= n) continue;
      int jv = P->fast ? P->four(P->x, P->y, P->z, n, i, p, e) : -1;
      int from = jv < 0 ? i + 4 : jv;
      for (int r = i; r < i + 4; r++) {
        if (!row_careful(P, r, from, n, &acc, bi, bj)) return 0;
      }
    }
  }
  for (; i < b; i++) {
    if (!row_careful(P, i, i + 1, n, &acc, bi, bj)) return 0;
  }
  int64_t E = 0;
  for (int k = 0; k < 4 * W; k++) {
    if (p[k] != 1) acc_add(&acc, log(p[k]));
    E += e[k];
  }
  // E·ln 2 as an exact product and its rounding error (E < 2^53 is exact as a double)
  double Ed = (double)E, hi = Ed * LN2;
  acc_add(&acc, hi);
  acc_add(&acc, fma(Ed, LN2, -hi) + Ed * LN2_REST);
  *out = acc.s + acc.c;
  return 1;
}

// ---------------------------------------------------------------- threads

typedef struct {
  const points_t *P;
  const int32_t *bounds;
  int K, T, t;
  double *parts;
  int *bad; // 2 per block: i, j (−1 when none)
} job_t;

static void *run_job(void *arg) {
  job_t *J = (job_t *)arg;
  for (int k = J->t; k < J->K; k += J->T) {
    int bi = -1, bj = -1;
    if (!block_sum(J->P, J->bounds[k], J->bounds[k + 1], &J->parts[k], &bi, &bj)) {
      J->parts[k] = NAN;
      J->bad[2 * k] = bi;
      J->bad[2 * k + 1] = bj;
    }
  }
  return NULL;
}

// ---------------------------------------------------------------- Node-API

static napi_value fail(napi_env env, const char *msg) {
  napi_throw_type_error(env, NULL, msg);
  return NULL;
}

static int f64_array(napi_env env, napi_value v, const double **data, size_t *len) {
  bool is;
  if (napi_is_typedarray(env, v, &is) != napi_ok || !is) return 0;
  napi_typedarray_type type;
  void *ptr;
  if (napi_get_typedarray_info(env, v, &type, len, &ptr, NULL, NULL) != napi_ok || type != napi_float64_array) return 0;
  *data = (const double *)ptr;
  return 1;
}

static napi_value log_pair_blocks(napi_env env, napi_callback_info info) {
  size_t argc = 6;
  napi_value argv[6];
  napi_get_cb_info(env, info, &argc, argv, NULL, NULL);
  if (argc < 5) return fail(env, "logPairBlocks(x, y, z, bounds, threads) takes five arguments");
  points_t P;
  size_t nx, ny, nz = 0;
  if (!f64_array(env, argv[0], &P.x, &nx) || !f64_array(env, argv[1], &P.y, &ny)) return fail(env, "x and y must be Float64Arrays");
  napi_valuetype zt;
  napi_typeof(env, argv[2], &zt);
  P.z = NULL;
  if (zt != napi_null && zt != napi_undefined) {
    if (!f64_array(env, argv[2], &P.z, &nz) || nz != nx) return fail(env, "z must be null or a Float64Array as long as x");
  }
  if (ny != nx || nx > 0x7fffffff) return fail(env, "x and y must have the same length (below 2^31)");
  P.n = (int)nx;
  bool is;
  napi_typedarray_type type;
  size_t nb;
  void *bp;
  if (napi_is_typedarray(env, argv[3], &is) != napi_ok || !is || napi_get_typedarray_info(env, argv[3], &type, &nb, &bp, NULL, NULL) != napi_ok || type != napi_int32_array || nb < 2)
    return fail(env, "bounds must be an Int32Array of at least two row boundaries");
  const int32_t *bounds = (const int32_t *)bp;
  int K = (int)nb - 1;
  if (bounds[0] != 0 || bounds[K] != P.n) return fail(env, "bounds must run from 0 to the number of points");
  for (int k = 0; k < K; k++) {
    if (bounds[k + 1] < bounds[k]) return fail(env, "bounds must not decrease");
  }
  int32_t T = 1;
  napi_get_value_int32(env, argv[4], &T);
  if (T < 1) T = 1;
  if (T > 64) T = 64;
  if (T > K) T = K;

  char want[16] = "";
  if (argc >= 6) {
    napi_valuetype wt;
    napi_typeof(env, argv[5], &wt);
    size_t len;
    if (wt == napi_string) napi_get_value_string_utf8(env, argv[5], want, sizeof want, &len);
  }
  const char *isa;
  P.four = pick_four(want[0] ? want : NULL, &P.width, &isa);
  double m = 0;
  for (int k = 0; k < P.n; k++) {
    double a = fabs(P.x[k]), b = fabs(P.y[k]), c = P.z ? fabs(P.z[k]) : 0;
    if (a > m) m = a;
    if (b > m) m = b;
    if (c > m) m = c;
  }
  P.fast = m < SAFE_COORD; // false also for NaN coordinates (which the engine refuses before)

  napi_value result;
  void *rp;
  napi_value buffer;
  napi_create_arraybuffer(env, sizeof(double) * K, &rp, &buffer);
  napi_create_typedarray(env, napi_float64_array, K, buffer, 0, &result);
  double *parts = (double *)rp;
  int *bad = (int *)malloc(sizeof(int) * 2 * K);
  if (!bad) return fail(env, "out of memory");
  for (int k = 0; k < 2 * K; k++) bad[k] = -1;
  job_t jobs[64];
  pthread_t threads[64];
  int started[64] = { 0 };
  for (int t = 0; t < T; t++) jobs[t] = (job_t){ &P, bounds, K, T, t, parts, bad };
  for (int t = 1; t < T; t++) started[t] = pthread_create(&threads[t], NULL, run_job, &jobs[t]) == 0;
  // job 0 runs on this thread, and so does any job whose thread could not start
  run_job(&jobs[0]);
  for (int t = 1; t < T; t++) {
    if (started[t]) pthread_join(threads[t], NULL);
    else run_job(&jobs[t]);
  }
  for (int k = 0; k < K; k++) {
    if (bad[2 * k] >= 0) {
      napi_value err, msg, vi, vj;
      napi_create_string_utf8(env, "coincident points", NAPI_AUTO_LENGTH, &msg);
      napi_create_error(env, NULL, msg, &err);
      napi_create_int32(env, bad[2 * k], &vi);
      napi_create_int32(env, bad[2 * k + 1], &vj);
      napi_set_named_property(env, err, "i", vi);
      napi_set_named_property(env, err, "j", vj);
      free(bad);
      napi_throw(env, err);
      return NULL;
    }
  }
  free(bad);
  return result;
}

static napi_value isa_name(napi_env env, napi_callback_info info) {
  (void)info;
  int w;
  const char *name;
  pick_four(NULL, &w, &name);
  napi_value s;
  napi_create_string_utf8(env, name, NAPI_AUTO_LENGTH, &s);
  return s;
}

NAPI_MODULE_INIT() {
  napi_value f, g;
  napi_create_function(env, "logPairBlocks", NAPI_AUTO_LENGTH, log_pair_blocks, NULL, &f);
  napi_set_named_property(env, exports, "logPairBlocks", f);
  napi_create_function(env, "isa", NAPI_AUTO_LENGTH, isa_name, NULL, &g);
  napi_set_named_property(env, exports, "isa", g);
  return exports;
}
