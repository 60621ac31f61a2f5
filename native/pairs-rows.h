// One instantiation of the vector kernel of pairs-native.c: four rows i..i+3 against the columns
// j ≥ i + 4, W lanes of doubles (GCC vector extensions). Included once per instruction set with
// QF_W (lanes), QF_FOUR (the function's name) and the type and helper names QF_VD, QF_VI, QF_LOAD,
// QF_SPLAT defined, under a `#pragma GCC target`; it undefines them at its end.
//
// Each row keeps W running products of squared distances. Every 4 steps, and at the end, each product
// is split into its binary exponent (added to a 64-bit integer per lane, exactly) and its mantissa in
// [1, 2), which carries on. With every coordinate below 1e34 in size each factor is below 2^233, so four
// factors keep a product below 2^933. A product whose exponent falls below −323 after four factors
// may have passed through the subnormal range (a factor at most 2^233 can lift a product from below
// 2^−1022 by at most 2^699 in the three remaining steps), and a product of 0 means coincident points:
// either makes the call return 0, with the state untouched, and the caller takes the careful path.

typedef double QF_VD __attribute__((vector_size(8 * QF_W)));
typedef int64_t QF_VI __attribute__((vector_size(8 * QF_W)));

static inline QF_VD QF_LOAD(const double *p) {
  QF_VD v;
  memcpy(&v, p, sizeof v);
  return v;
}

static inline QF_VD QF_SPLAT(double a) {
  QF_VD v;
  for (int l = 0; l < QF_W; l++) v[l] = a;
  return v;
}

// splits p into exponent (added to e) and mantissa; sets lanes of bad where the product is unsafe
#define QF_RENORM(p, e) do { \
    QF_VI bits = (QF_VI)(p); \
    QF_VI ex = (bits >> 52) & 0x7ff; \
    bad |= (ex < 1023 - 323) | (ex == 0x7ff); \
    (e) += ex - 1023; \
    (p) = (QF_VD)((bits & 0x000fffffffffffffLL) | 0x3ff0000000000000LL); \
  } while (0)

/* Returns the first column not summed (the caller sums columns [that, n) carefully), or −1 when the
   careful path must redo these rows; p (4·W products) and e (4·W exponents) carry from call to call. */
static int QF_FOUR(const double *X, const double *Y, const double *Z, int n, int i, double *pst, int64_t *est) {
  QF_VD p0 = QF_LOAD(pst), p1 = QF_LOAD(pst + QF_W), p2 = QF_LOAD(pst + 2 * QF_W), p3 = QF_LOAD(pst + 3 * QF_W);
  QF_VI e0, e1, e2, e3;
  memcpy(&e0, est, sizeof e0);
  memcpy(&e1, est + QF_W, sizeof e1);
  memcpy(&e2, est + 2 * QF_W, sizeof e2);
  memcpy(&e3, est + 3 * QF_W, sizeof e3);
  const QF_VD x0 = QF_SPLAT(X[i]), x1 = QF_SPLAT(X[i + 1]), x2 = QF_SPLAT(X[i + 2]), x3 = QF_SPLAT(X[i + 3]);
  const QF_VD y0 = QF_SPLAT(Y[i]), y1 = QF_SPLAT(Y[i + 1]), y2 = QF_SPLAT(Y[i + 2]), y3 = QF_SPLAT(Y[i + 3]);
  QF_VI bad = { 0 };
  int j = i + 4;
  int step = 0;
  if (Z) {
    const QF_VD z0 = QF_SPLAT(Z[i]), z1 = QF_SPLAT(Z[i + 1]), z2 = QF_SPLAT(Z[i + 2]), z3 = QF_SPLAT(Z[i + 3]);
    for (; j + QF_W <= n; j += QF_W) {
      const QF_VD xj = QF_LOAD(X + j), yj = QF_LOAD(Y + j), zj = QF_LOAD(Z + j);
      QF_VD a, b, c;
      a = x0 - xj; b = y0 - yj; c = z0 - zj; p0 *= a * a + b * b + c * c;
      a = x1 - xj; b = y1 - yj; c = z1 - zj; p1 *= a * a + b * b + c * c;
      a = x2 - xj; b = y2 - yj; c = z2 - zj; p2 *= a * a + b * b + c * c;
      a = x3 - xj; b = y3 - yj; c = z3 - zj; p3 *= a * a + b * b + c * c;
      if ((++step & 3) == 0) {
        QF_RENORM(p0, e0); QF_RENORM(p1, e1); QF_RENORM(p2, e2); QF_RENORM(p3, e3);
      }
    }
  }
  else {
    for (; j + QF_W <= n; j += QF_W) {
      const QF_VD xj = QF_LOAD(X + j), yj = QF_LOAD(Y + j);
      QF_VD a, b;
      a = x0 - xj; b = y0 - yj; p0 *= a * a + b * b;
      a = x1 - xj; b = y1 - yj; p1 *= a * a + b * b;
      a = x2 - xj; b = y2 - yj; p2 *= a * a + b * b;
      a = x3 - xj; b = y3 - yj; p3 *= a * a + b * b;
      if ((++step & 3) == 0) {
        QF_RENORM(p0, e0); QF_RENORM(p1, e1); QF_RENORM(p2, e2); QF_RENORM(p3, e3);
      }
    }
  }
  QF_RENORM(p0, e0); QF_RENORM(p1, e1); QF_RENORM(p2, e2); QF_RENORM(p3, e3);
  for (int l = 0; l < QF_W; l++) if (bad[l]) return -1;
  memcpy(pst, &p0, sizeof p0);
  memcpy(pst + QF_W, &p1, sizeof p1);
  memcpy(pst + 2 * QF_W, &p2, sizeof p2);
  memcpy(pst + 3 * QF_W, &p3, sizeof p3);
  memcpy(est, &e0, sizeof e0);
  memcpy(est + QF_W, &e1, sizeof e1);
  memcpy(est + 2 * QF_W, &e2, sizeof e2);
  memcpy(est + 3 * QF_W, &e3, sizeof e3);
  return j;
}

#undef QF_RENORM
#undef QF_W
#undef QF_VD
#undef QF_VI
#undef QF_LOAD
#undef QF_SPLAT
#undef QF_FOUR
