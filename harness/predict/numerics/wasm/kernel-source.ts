/**
 * WebAssembly text of the transverse-field product kernels (SIMD, two doubles a lane pair). Assembled into
 * transverse-kernels.wasm by scripts/build-kernels.mjs at build time; loaded by kernels.ts.
 *
 * Why WebAssembly: the product does n loads and adds per amplitude. Scalar JavaScript spends about two cycles on
 * each (bounds checks, no vector registers) and is compute-bound well above the memory-bandwidth floor; f64x2
 * lanes and unchecked loads from linear memory do the same work about five times faster on cache-resident data,
 * so the product becomes memory-bound. The kernels work on scratch copies that fit in cache (blocked-product.ts
 * gathers and scatters them), so the 4 GiB limit of 32-bit linear memory never bounds the problem size.
 *
 * Every amplitude group is eight doubles (four v128): flips of the three lowest scratch bits are lane swaps and
 * register exchanges, every other flip is a load of the partner group. Sums are formed in the order of the scalar
 * kernel of transverse-field.ts (the three in-group flips, then the bits upwards).
 *
 * Exports (all offsets and sizes in bytes, multiples of 64; sizes powers of two):
 *   lowLevels8 / lowLevels16 / lowAffine (v, vp, diag, table, w, nb, σ, γ, sx[, scale, shift, cap]):
 *     over one block of nb bytes, w = σ·d·v + sx·Σ_{bits of the block} v[z ^ bit] − γ·vp, with d from one-byte or
 *     two-byte cost levels and a table of doubles, or d = min(cap, scale·c + shift) from doubles c.
 *   high (v, w, hb, lo, mirror, sx) → Σ w·v:
 *     w += sx·Σ_{lo ≤ bit < hb} v[z ^ bit] inside each half of hb bytes, and with mirror = 1 also the partner at the
 *     reversed position of the other half (the flip-symmetric sector's top-qubit flip); returns wᵀv over all halves.
 */

const SWAP = "i8x16.shuffle 8 9 10 11 12 13 14 15 0 1 2 3 4 5 6 7";
const LANES = [0, 1, 2, 3] as const;

/** Loads the group at byte address `addr` into x0 … x3 and sets a0 … a3 to the sums of its three in-group flips. */
function groupStart(addr: string): string {
  const loads = LANES.map((k) => `(local.set $x${k} (v128.load offset=${16 * k} ${addr}))`).join("\n");
  // Lane pair k holds amplitudes 2k, 2k+1: flip of bit 0 = swapped lanes, bit 1 = pair k^1, bit 2 = pair k^2.
  const sums = LANES.map(
    (k) =>
      `(local.set $a${k} (f64x2.add (f64x2.add (${SWAP} (local.get $x${k}) (local.get $x${k})) (local.get $x${k ^ 1})) (local.get $x${k ^ 2})))`,
  ).join("\n");
  return `${loads}\n${sums}`;
}

/** Adds the partner group at byte address held in $p to a0 … a3. */
const ADD_PARTNER = LANES.map((k) => `(local.set $a${k} (f64x2.add (local.get $a${k}) (v128.load offset=${16 * k} (local.get $p))))`).join("\n");

const GROUP_LOCALS = `(local $i i32) (local $bit i32) (local $p i32)
    (local $x0 v128) (local $x1 v128) (local $x2 v128) (local $x3 v128)
    (local $a0 v128) (local $a1 v128) (local $a2 v128) (local $a3 v128)`;

/** The diagonal of lane pair k as a v128 expression, per diagonal kind. */
type DiagonalOf = (k: number) => string;

/** d of lane pair k from cost levels of `bytes` bytes each (1 or 2) and the table of doubles at $table. */
function levelDiagonal(bytes: 1 | 2): DiagonalOf {
  const load = bytes === 1 ? "i32.load8_u" : "i32.load16_u";
  const entry = (amp: number) =>
    `(f64.load (i32.add (local.get $table) (i32.shl (${load} offset=${amp * bytes} (local.get $q)) (i32.const 3))))`;
  return (k) => `(f64x2.replace_lane 1 (f64x2.splat ${entry(2 * k)}) ${entry(2 * k + 1)})`;
}

/** d of lane pair k = min(cap, scale·c + shift) from doubles c at $q. */
const affineDiagonal: DiagonalOf = (k) =>
  `(f64x2.min (local.get $scap) (f64x2.add (f64x2.mul (local.get $sscale) (v128.load offset=${16 * k} (local.get $q))) (local.get $sshift)))`;

/**
 * One low-block kernel: every flip inside the block, the diagonal and the recurrence term.
 * @param qOf - byte address of the group's diagonal data from the group offset $i.
 */
function lowKernel(name: string, diagonal: DiagonalOf, qOf: string, affine: boolean): string {
  const extraParams = affine ? "(param $scale f64) (param $shift f64) (param $cap f64)" : "";
  const extraLocals = affine ? "(local $sscale v128) (local $sshift v128) (local $scap v128)" : "";
  const extraSetup = affine
    ? `(local.set $sscale (f64x2.splat (local.get $scale)))
    (local.set $sshift (f64x2.splat (local.get $shift)))
    (local.set $scap (f64x2.splat (local.get $cap)))`
    : "";
  const stores = LANES.map(
    (k) => `(v128.store offset=${16 * k} (local.get $p)
        (f64x2.sub
          (f64x2.add
            (f64x2.mul (f64x2.mul (local.get $ssig) ${diagonal(k)}) (local.get $x${k}))
            (f64x2.mul (local.get $ssx) (local.get $a${k})))
          (f64x2.mul (local.get $sgam) (v128.load offset=${16 * k} (i32.add (local.get $vp) (local.get $i))))))`,
  ).join("\n");
  return `
  (func (export "${name}")
    (param $v i32) (param $vp i32) (param $diag i32) (param $table i32) (param $w i32) (param $nb i32)
    (param $sigma f64) (param $gamma f64) (param $sx f64) ${extraParams}
    ${GROUP_LOCALS}
    (local $q i32) (local $ssig v128) (local $sgam v128) (local $ssx v128) ${extraLocals}
    (local.set $ssig (f64x2.splat (local.get $sigma)))
    (local.set $sgam (f64x2.splat (local.get $gamma)))
    (local.set $ssx (f64x2.splat (local.get $sx)))
    ${extraSetup}
    (block $done (loop $group
      (br_if $done (i32.ge_u (local.get $i) (local.get $nb)))
      ${groupStart("(i32.add (local.get $v) (local.get $i))")}
      (local.set $bit (i32.const 64))
      (block $bits (loop $flip
        (br_if $bits (i32.ge_u (local.get $bit) (local.get $nb)))
        (local.set $p (i32.add (local.get $v) (i32.xor (local.get $i) (local.get $bit))))
        ${ADD_PARTNER}
        (local.set $bit (i32.shl (local.get $bit) (i32.const 1)))
        (br $flip)))
      (local.set $q ${qOf})
      (local.set $p (i32.add (local.get $w) (local.get $i)))
      ${stores}
      (local.set $i (i32.add (local.get $i) (i32.const 64)))
      (br $group)))
  )`;
}

/**
 * The high-bit kernel (see the module comment). Groups in address order: every partner is then a sequential stream
 * the prefetchers follow. (Slab orders that revisit a slice of every run before moving on measured slower, 0.28–0.84
 * against 0.24–0.39 ns per amplitude·flip on a 4–8 MiB scratch: the partner lines are then scattered over pages.)
 */
function highKernel(): string {
  const mirrorAdds = LANES.map(
    // Amplitude j of this half pairs with amplitude (half − 1 − j) of the other: the other half's group at the
    // reversed offset, lane pairs in reverse order and lanes swapped.
    (k) => `(local.set $a${k} (f64x2.add (local.get $a${k}) (${SWAP} (v128.load offset=${16 * (3 - k)} (local.get $p)) (v128.load offset=${16 * (3 - k)} (local.get $p)))))`,
  ).join("\n");
  const finish = LANES.map(
    (k) => `(local.set $y (f64x2.add (v128.load offset=${16 * k} (local.get $p)) (f64x2.mul (local.get $ssx) (local.get $a${k}))))
        (v128.store offset=${16 * k} (local.get $p) (local.get $y))
        (local.set $acc (f64x2.add (local.get $acc) (f64x2.mul (local.get $y) (v128.load offset=${16 * k} (i32.add (local.get $base) (local.get $i))))))`,
  ).join("\n");
  const zero = LANES.map((k) => `(local.set $a${k} (v128.const f64x2 0 0))`).join("\n");
  return `
  (func (export "high") (param $v i32) (param $w i32) (param $hb i32) (param $lo i32) (param $mirror i32) (param $sx f64) (result f64)
    ${GROUP_LOCALS}
    (local $half i32) (local $base i32) (local $other i32) 
    (local $ssx v128) (local $acc v128) (local $y v128)
    (local.set $ssx (f64x2.splat (local.get $sx)))
    (local.set $acc (v128.const f64x2 0 0))
    (block $halves (loop $each
      (br_if $halves (i32.gt_u (local.get $half) (local.get $mirror)))
      ;; $base: this half's v; $other: the other half's v (mirror only).
      (local.set $base (i32.add (local.get $v) (i32.mul (local.get $half) (local.get $hb))))
      (local.set $other (i32.add (local.get $v) (i32.mul (i32.sub (i32.const 1) (local.get $half)) (local.get $hb))))
      (local.set $i (i32.const 0))
        (block $done (loop $group
          (br_if $done (i32.ge_u (local.get $i) (local.get $hb)))
          ${zero}
          (local.set $bit (local.get $lo))
          (block $bits (loop $flip
            (br_if $bits (i32.ge_u (local.get $bit) (local.get $hb)))
            (local.set $p (i32.add (local.get $base) (i32.xor (local.get $i) (local.get $bit))))
            ${ADD_PARTNER}
            (local.set $bit (i32.shl (local.get $bit) (i32.const 1)))
            (br $flip)))
          (if (local.get $mirror) (then
            (local.set $p (i32.add (local.get $other) (i32.sub (i32.sub (local.get $hb) (i32.const 64)) (local.get $i))))
            ${mirrorAdds}))
          (local.set $p (i32.add (i32.add (local.get $w) (i32.mul (local.get $half) (local.get $hb))) (local.get $i)))
          ${finish}
          (local.set $i (i32.add (local.get $i) (i32.const 64)))
          (br $group)))
      (local.set $half (i32.add (local.get $half) (i32.const 1)))
      (br $each)))
    (f64.add (f64x2.extract_lane 0 (local.get $acc)) (f64x2.extract_lane 1 (local.get $acc)))
  )`;
}

/** The whole module: linear memory imported as env.memory (sized by the caller), the four kernels exported. */
export function transverseKernelText(): string {
  return `(module
  (import "env" "memory" (memory 1))
  ${lowKernel("lowLevels8", levelDiagonal(1), "(i32.add (local.get $diag) (i32.shr_u (local.get $i) (i32.const 3)))", false)}
  ${lowKernel("lowLevels16", levelDiagonal(2), "(i32.add (local.get $diag) (i32.shr_u (local.get $i) (i32.const 2)))", false)}
  ${lowKernel("lowAffine", affineDiagonal, "(i32.add (local.get $diag) (local.get $i))", true)}
  ${highKernel()}
)`;
}
