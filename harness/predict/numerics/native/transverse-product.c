/*
 * The transverse-field product w = σ·(d∘v) + sx·Σ_i X_i v − γ·v' (sx = −σ·field), in place on the vectors' own
 * memory, as a Node-API addon built at install time by scripts/build-native.mjs. Same two passes and the same plan
 * as blocked-product.ts (see there); what differs from the WebAssembly kernels:
 *
 *   - the kernels read and write the SharedArrayBuffers directly: only v is copied, into padded rows that stay in
 *     the cache (see pass_a_body and pass_b), so a product moves about 49 bytes per amplitude to and from memory
 *     (one-byte levels) and makes no copies of v', w or the diagonal;
 *   - vectors of eight doubles (GCC vector extensions, compiled for AVX-512, AVX2 and plain x86-64 with
 *     target_clones and picked at load time by the processor's features), against two in WebAssembly SIMD;
 *   - pass B walks each group in tiles of columns across all of its rows, so the partner rows of a tile stay in
 *     the inner caches while the flips of every high bit read them.
 *
 * Every group of eight amplitudes is one vector: the flips of bits 0–2 are lane permutations, every other flip a
 * load of the partner group. Pass A sums four groups side by side (four independent add chains).
 */
#include <node_api.h>
#include <stdlib.h>
#include <stdint.h>
#include <string.h>

typedef double v8d __attribute__((vector_size(64)));
/* The same vector read or written at any 8-byte-aligned address. */
typedef double v8u __attribute__((vector_size(64), aligned(8)));
typedef int64_t v8i __attribute__((vector_size(64)));

#if defined(__x86_64__) && defined(__GNUC__) && !defined(__clang__)
#define KERNEL __attribute__((target_clones("avx512f", "avx2", "default")))
#else
#define KERNEL
#endif

static inline __attribute__((always_inline)) v8d load(const double *p) { return *(const v8u *)p; }
static inline __attribute__((always_inline)) void store(double *p, v8d x) { *(v8u *)p = x; }
static inline __attribute__((always_inline)) v8d splat(double a) {
  v8d r = {a}; /* one broadcast (a lane-by-lane initialiser compiles to eight masked ones) */
  return __builtin_shuffle(r, (v8i){0, 0, 0, 0, 0, 0, 0, 0});
}

/* Σ of the flips of bits 0, 1, 2 for the eight amplitudes of x. */
static inline __attribute__((always_inline)) v8d in_group(v8d x) {
  return __builtin_shuffle(x, (v8i){1, 0, 3, 2, 5, 4, 7, 6}) + __builtin_shuffle(x, (v8i){2, 3, 0, 1, 6, 7, 4, 5}) +
         __builtin_shuffle(x, (v8i){4, 5, 6, 7, 0, 1, 2, 3});
}

/* The diagonal kinds of transverse-field.ts. */
enum { LEVELS8 = 0, LEVELS16 = 1, AFFINE = 2 };

typedef struct {
  int kind;
  const void *data;     /* uint8 or uint16 levels, or double costs */
  const double *table;  /* d per level */
  double scale, shift, cap;
} diagonal_t;

/* d for the eight amplitudes starting at z; `kind` is a constant in each specialised copy of pass A. */
static inline __attribute__((always_inline)) v8d diag8(const diagonal_t *d, int kind, v8d scale, v8d shift, v8d cap,
                                                      int64_t z) {
  if (kind == LEVELS8) {
    const uint8_t *l = (const uint8_t *)d->data + z;
    const double *t = d->table;
    return (v8d){t[l[0]], t[l[1]], t[l[2]], t[l[3]], t[l[4]], t[l[5]], t[l[6]], t[l[7]]};
  }
  if (kind == LEVELS16) {
    const uint16_t *l = (const uint16_t *)d->data + z;
    const double *t = d->table;
    return (v8d){t[l[0]], t[l[1]], t[l[2]], t[l[3]], t[l[4]], t[l[5]], t[l[6]], t[l[7]]};
  }
  v8d c = load((const double *)d->data + z) * scale + shift;
  v8i below = c < cap; /* lanes of all ones where c < cap: min(cap, c), as f64x2.min for finite c */
  return (v8d)(((v8i)c & below) | ((v8i)cap & ~below));
}

/* Pass A's rows: 2^ROW_BITS amplitudes (4 KiB), copied ROW_PITCH apart into the thread's scratch. */
#define ROW_BITS 9
#define ROW_PITCH ((1 << ROW_BITS) + 8)

/*
 * Pass A over blocks [from, to) of 2^low amplitudes: w = σ·d∘v + sx·Σ_{bits < low} flips − γ·v', every group's
 * sum finished at once so that w is written once.
 *
 * A block of at least one row is first copied into `scratch` in rows of 4 KiB, one cache line apart more than
 * their length: in place, the partners of the bits from 2^9 up lie 4 KiB multiples apart, all in one set of the
 * first-level cache, and evict each other on every group (n = 26, one thread: 3.2–3.9 ns per amplitude in place,
 * 2.0–2.2 from the padded rows, copy included). Partners of the bits below 2^9 are then in the same row, those
 * above in the row whose index differs in one bit.
 */
static inline __attribute__((always_inline)) void pass_a_body(const double *v, const double *vp, const diagonal_t *d,
                                                             const int kind, double *w, double *scratch,
                                                             double sigma, double gamma, double sx, int low,
                                                             int64_t from, int64_t to) {
  const int64_t block = (int64_t)1 << low;
  const v8d ssig = splat(sigma), sgam = splat(gamma), ssx = splat(sx);
  const v8d scale = splat(d->scale), shift = splat(d->shift), cap = splat(d->cap);
  const int64_t rowLength = (int64_t)1 << ROW_BITS;
  for (int64_t b = from; b < to; b++) {
    const int64_t start = b * block;
    if (block < rowLength) { /* small plans (tests): in place, one group at a time */
      const double *vb = v + start;
      for (int64_t i = 0; i < block; i += 8) {
        v8d x = load(vb + i), a = in_group(x);
        for (int64_t bit = 8; bit < block; bit <<= 1) a += load(vb + (i ^ bit));
        const int64_t z = start + i;
        store(w + z, ssig * diag8(d, kind, scale, shift, cap, z) * x + ssx * a - sgam * load(vp + z));
      }
      continue;
    }
    const int64_t rows = block >> ROW_BITS;
    for (int64_t r = 0; r < rows; r++) memcpy(scratch + r * ROW_PITCH, v + start + (r << ROW_BITS), 8 * rowLength);
    for (int64_t r = 0; r < rows; r++) {
      const double *row = scratch + r * ROW_PITCH;
      for (int64_t c = 0; c < rowLength; c += 32) {
        v8d x0 = load(row + c), x1 = load(row + c + 8), x2 = load(row + c + 16), x3 = load(row + c + 24);
        v8d a0 = in_group(x0), a1 = in_group(x1), a2 = in_group(x2), a3 = in_group(x3);
        for (int64_t bit = 8; bit < rowLength; bit <<= 1) {
          a0 += load(row + (c ^ bit));
          a1 += load(row + ((c + 8) ^ bit));
          a2 += load(row + ((c + 16) ^ bit));
          a3 += load(row + ((c + 24) ^ bit));
        }
        for (int64_t rb = 1; rb < rows; rb <<= 1) {
          const double *p = scratch + (r ^ rb) * ROW_PITCH + c;
          a0 += load(p);
          a1 += load(p + 8);
          a2 += load(p + 16);
          a3 += load(p + 24);
        }
        const int64_t z = start + (r << ROW_BITS) + c;
        store(w + z, ssig * diag8(d, kind, scale, shift, cap, z) * x0 + ssx * a0 - sgam * load(vp + z));
        store(w + z + 8, ssig * diag8(d, kind, scale, shift, cap, z + 8) * x1 + ssx * a1 - sgam * load(vp + z + 8));
        store(w + z + 16, ssig * diag8(d, kind, scale, shift, cap, z + 16) * x2 + ssx * a2 - sgam * load(vp + z + 16));
        store(w + z + 24, ssig * diag8(d, kind, scale, shift, cap, z + 24) * x3 + ssx * a3 - sgam * load(vp + z + 24));
      }
    }
  }
}

/* Pass A with the diagonal's kind fixed at compile time, one copy per kind. */
KERNEL static void pass_a(const double *v, const double *vp, const diagonal_t *d, double *w, double *scratch,
                          double sigma, double gamma, double sx, int low, int64_t from, int64_t to) {
  if (d->kind == LEVELS8) pass_a_body(v, vp, d, LEVELS8, w, scratch, sigma, gamma, sx, low, from, to);
  else if (d->kind == LEVELS16) pass_a_body(v, vp, d, LEVELS16, w, scratch, sigma, gamma, sx, low, from, to);
  else pass_a_body(v, vp, d, AFFINE, w, scratch, sigma, gamma, sx, low, from, to);
}

/*
 * Pass B over groups [from, to): group q holds the 2^high runs of 2^run amplitudes at q·2^run + y·2^low, y < 2^high;
 * with mirror also the runs of the complemented q, whose amplitudes are the mirror partners (z → dim − 1 − z).
 * w += sx·(Σ_{bits ≥ low} flips [+ mirror partner]); returns the group's part of wᵀv.
 *
 * The runs of v are first copied into `scratch`, one row each, rows 2^run + 8 amplitudes apart: in place they lie
 * 2^low amplitudes (2 MiB) apart, so the partners of one column all fall in the same cache set and evict each other
 * (measured: 5–6 ns per amplitude at n = 28 in place). The rows are then walked in tiles of `tile` columns, so the
 * tile's partners (2^high rows × tile) stay in the inner cache while every high flip reads them; w is updated in place.
 */
KERNEL static double pass_b(const double *v, double *w, double *scratch, double sx, int bits, int low, int run,
                            int high, int mirror, int64_t tile, int64_t from, int64_t to) {
  const int64_t runn = (int64_t)1 << run, rows = (int64_t)1 << high, stride = (int64_t)1 << low;
  const int64_t pitch = runn + 8, halfsize = rows * pitch;
  const int64_t complement = ((int64_t)1 << (low - run)) - 1;
  const v8d ssx = splat(sx);
  const v8i reverse = {7, 6, 5, 4, 3, 2, 1, 0};
  if (tile > runn) tile = runn;
  v8d acc0 = splat(0), acc1 = acc0;
  for (int64_t q = from; q < to; q++) {
    for (int h = 0; h <= mirror; h++) {
      const int64_t first = (h == 0 ? q : (q ^ complement)) * runn;
      for (int64_t y = 0; y < rows; y++) memcpy(scratch + h * halfsize + y * pitch, v + first + y * stride, 8 * runn);
    }
    for (int h = 0; h <= mirror; h++) {
      const int64_t first = (h == 0 ? q : (q ^ complement)) * runn;
      const double *own = scratch + h * halfsize, *other = scratch + (1 - h) * halfsize;
      for (int64_t t = 0; t < runn; t += tile) {
        for (int64_t y = 0; y < rows; y++) {
          const double *row = own + y * pitch;
          double *wr = w + first + y * stride;
          /* w two rows on: each row's slice of w is a short run in its own page, too short for the hardware
             prefetcher (n = 28, one thread: 3.9 → 3.1 ns per amplitude for this pass). */
          const double *ahead = w + first + ((y + 2) & (rows - 1)) * stride;
          int64_t j = t;
          for (; j + 16 <= t + tile; j += 16) {
            __builtin_prefetch(ahead + j, 1, 3);
            __builtin_prefetch(ahead + j + 8, 1, 3);
            v8d a0 = splat(0), a1 = a0;
            for (int hb = 0; hb < high; hb++) {
              const double *partner = own + (y ^ ((int64_t)1 << hb)) * pitch + j;
              a0 += load(partner);
              a1 += load(partner + 8);
            }
            if (mirror) {
              const double *m = other + (rows - 1 - y) * pitch + runn - 16 - j;
              a0 += __builtin_shuffle(load(m + 8), reverse);
              a1 += __builtin_shuffle(load(m), reverse);
            }
            v8d y0 = load(wr + j) + ssx * a0, y1 = load(wr + j + 8) + ssx * a1;
            store(wr + j, y0);
            store(wr + j + 8, y1);
            acc0 += y0 * load(row + j);
            acc1 += y1 * load(row + j + 8);
          }
          for (; j < t + tile; j += 8) { /* runs or tiles of eight amplitudes */
            v8d a = splat(0);
            for (int hb = 0; hb < high; hb++) a += load(own + (y ^ ((int64_t)1 << hb)) * pitch + j);
            if (mirror) a += __builtin_shuffle(load(other + (rows - 1 - y) * pitch + runn - 8 - j), reverse);
            v8d y0 = load(wr + j) + ssx * a;
            store(wr + j, y0);
            acc0 += y0 * load(row + j);
          }
        }
      }
    }
  }
  v8d acc = acc0 + acc1;
  double sum = 0;
  for (int k = 0; k < 8; k++) sum += acc[k];
  return sum;
}

/* ---- Node-API glue ---- */

#define CHECK(call)                                                      \
  do {                                                                   \
    if ((call) != napi_ok) {                                             \
      napi_throw_error(env, NULL, "transverse-product: bad argument");   \
      return NULL;                                                       \
    }                                                                    \
  } while (0)

/* The data pointer and element count of a typed array argument of the given element type; 0 if it is not one. */
static int typed(napi_env env, napi_value value, napi_typedarray_type want, void **data, size_t *length) {
  napi_typedarray_type type;
  napi_value buffer;
  size_t offset;
  return napi_get_typedarray_info(env, value, &type, length, data, &buffer, &offset) == napi_ok && type == want;
}

/* Reads `count` numeric arguments into `out`; 0 (a TypeError thrown) if one is not a number. */
static int numbers(napi_env env, const napi_value *args, size_t count, double *out) {
  for (size_t i = 0; i < count; i++) {
    if (napi_get_value_double(env, args[i], &out[i]) != napi_ok) {
      napi_throw_type_error(env, NULL, "transverse-product: expected a number");
      return 0;
    }
  }
  return 1;
}

/* x is a whole number in [lo, hi] (sizes and ranges: also keeps every shift below 2^62). */
static int whole(double x, double lo, double hi) { return x == (double)(int64_t)x && x >= lo && x <= hi; }

/* The passes' scratch: one per thread (per Node-API environment), grown as plans need, freed with the thread. */
typedef struct {
  double *data;
  size_t bytes;
} scratch_t;

static void free_scratch(napi_env env, void *data, void *hint) {
  (void)env;
  (void)hint;
  scratch_t *s = data;
  free(s->data);
  free(s);
}

static double *thread_scratch(napi_env env, size_t bytes) {
  scratch_t *s = NULL;
  if (napi_get_instance_data(env, (void **)&s) != napi_ok) return NULL;
  if (s == NULL) {
    s = calloc(1, sizeof *s);
    if (s == NULL || napi_set_instance_data(env, s, free_scratch, NULL) != napi_ok) {
      free(s);
      return NULL;
    }
  }
  if (s->bytes < bytes) {
    free(s->data);
    s->data = aligned_alloc(64, (bytes + 63) & ~(size_t)63);
    s->bytes = s->data == NULL ? 0 : bytes;
  }
  return s->data;
}

/* passA(v, vprev, kind, data, table, w, σ, γ, sx, scale, shift, cap, low, from, to): see kernels.ts. */
static napi_value js_pass_a(napi_env env, napi_callback_info info) {
  size_t argc = 15;
  napi_value args[15];
  CHECK(napi_get_cb_info(env, info, &argc, args, NULL, NULL));
  if (argc != 15) {
    napi_throw_error(env, NULL, "transverse-product: passA takes 15 arguments");
    return NULL;
  }
  double kind, x[9]; /* σ, γ, sx, scale, shift, cap, low, from, to */
  if (!numbers(env, args + 2, 1, &kind) || !numbers(env, args + 6, 9, x)) return NULL;
  if (!whole(kind, LEVELS8, AFFINE)) {
    napi_throw_range_error(env, NULL, "transverse-product: passA diagonal kind must be 0, 1 or 2");
    return NULL;
  }
  static const napi_typedarray_type data_type[] = {napi_uint8_array, napi_uint16_array, napi_float64_array};
  void *v, *vp, *data, *table = NULL, *w;
  size_t nv, nvp, ndata, ntable = 0, nw;
  napi_valuetype tt;
  CHECK(napi_typeof(env, args[4], &tt));
  if (!typed(env, args[0], napi_float64_array, &v, &nv) || !typed(env, args[1], napi_float64_array, &vp, &nvp) ||
      !typed(env, args[3], data_type[(int)kind], &data, &ndata) || !typed(env, args[5], napi_float64_array, &w, &nw) ||
      (tt != napi_null && !typed(env, args[4], napi_float64_array, &table, &ntable)) ||
      ((int)kind != AFFINE && table == NULL)) {
    napi_throw_type_error(env, NULL,
                          "transverse-product: passA expects Float64Arrays v, vprev, w, levels (Uint8Array or "
                          "Uint16Array) with a Float64Array table, or Float64Array costs");
    return NULL;
  }
  const double low = x[6], from = x[7], to = x[8];
  if (!whole(low, 3, 40) || !whole(from, 0, to) || !whole(to, from, (double)(nv >> (int)low)) || nvp < nv || nw < nv ||
      ndata < nv) {
    napi_throw_range_error(env, NULL, "transverse-product: passA sizes do not fit the plan");
    return NULL;
  }
  diagonal_t d = {(int)kind, data, (const double *)table, x[3], x[4], x[5]};
  /* Pass A's rows (blocks shorter than a row take no scratch; one row is asked for all the same). */
  const int64_t rows = ((int64_t)1 << (int)low) >> ROW_BITS;
  double *scratch = thread_scratch(env, 8 * (size_t)ROW_PITCH * (size_t)(rows > 0 ? rows : 1));
  if (scratch == NULL) {
    napi_throw_error(env, NULL, "transverse-product: no memory for pass A's scratch");
    return NULL;
  }
  pass_a((const double *)v, (const double *)vp, &d, (double *)w, scratch, x[0], x[1], x[2], (int)low, (int64_t)from,
         (int64_t)to);
  return NULL;
}

/* passB(v, w, sx, bits, low, run, high, mirror, tile, from, to) → wᵀv of the groups: see kernels.ts. */
static napi_value js_pass_b(napi_env env, napi_callback_info info) {
  size_t argc = 11;
  napi_value args[11];
  CHECK(napi_get_cb_info(env, info, &argc, args, NULL, NULL));
  if (argc != 11) {
    napi_throw_error(env, NULL, "transverse-product: passB takes 11 arguments");
    return NULL;
  }
  void *v, *w;
  size_t nv, nw;
  if (!typed(env, args[0], napi_float64_array, &v, &nv) || !typed(env, args[1], napi_float64_array, &w, &nw)) {
    napi_throw_type_error(env, NULL, "transverse-product: passB expects Float64Arrays v and w");
    return NULL;
  }
  double x[9]; /* sx, bits, low, run, high, mirror, tile, from, to */
  if (!numbers(env, args + 2, 9, x)) return NULL;
  const double bits = x[1], low = x[2], run = x[3], high = x[4], mirror = x[5], tile = x[6], from = x[7], to = x[8];
  if (!whole(bits, 4, 40) || !whole(low, 4, bits) || !whole(run, 3, low - 1) || high != bits - low ||
      !whole(mirror, 0, 1) || ((size_t)1 << (int)bits) > nv || nw < nv || !whole(tile, 8, 1e15) ||
      !whole(from, 0, to) || !whole(to, from, (double)((int64_t)1 << (int)(low - run - mirror)))) {
    napi_throw_range_error(env, NULL, "transverse-product: passB sizes do not fit the plan");
    return NULL;
  }
  const size_t bytes = 8 * (size_t)(mirror + 1) * ((size_t)1 << (int)high) * (((size_t)1 << (int)run) + 8);
  double *scratch = thread_scratch(env, bytes);
  if (scratch == NULL) {
    napi_throw_error(env, NULL, "transverse-product: no memory for pass B's scratch");
    return NULL;
  }
  double alpha = pass_b((const double *)v, (double *)w, scratch, x[0], (int)bits, (int)low, (int)run, (int)high,
                        (int)mirror, (int64_t)tile, (int64_t)from, (int64_t)to);
  napi_value result;
  CHECK(napi_create_double(env, alpha, &result));
  return result;
}

NAPI_MODULE_INIT() {
  napi_value fa, fb;
  if (napi_create_function(env, "passA", NAPI_AUTO_LENGTH, js_pass_a, NULL, &fa) != napi_ok ||
      napi_create_function(env, "passB", NAPI_AUTO_LENGTH, js_pass_b, NULL, &fb) != napi_ok ||
      napi_set_named_property(env, exports, "passA", fa) != napi_ok ||
      napi_set_named_property(env, exports, "passB", fb) != napi_ok)
    return NULL;
  return exports;
}
