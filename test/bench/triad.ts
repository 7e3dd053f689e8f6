/**
 * Memory bandwidth for the benches' floors: a STREAM triad a = b + s·c (McCalpin, "Memory bandwidth and machine
 * balance in current high performance computers", IEEE TCCA Newsletter, 1995; 24 bytes per element, write-allocate
 * traffic not counted, as STREAM counts) in WebAssembly SIMD, on one thread or several at once.
 *
 * Why not a JavaScript loop: a scalar JS triad is bound by its instructions (bounds checks, one double at a time),
 * not by memory: on the 2-core test machine it reached 7.5 GB/s where this kernel reaches 12–15 GB/s on one thread,
 * so a floor from it would be twice too lenient. The kernel is assembled here with wabt (a devDependency, as for the
 * product kernels), so the bench measures with the same kind of code the product runs.
 */
import { Worker } from "node:worker_threads";
import wabtInit from "wabt";

/** Bytes of each of the three arrays: far beyond the last-level cache. */
const ARRAY_BYTES = 256 * 2 ** 20;
const ROUNDS = 5;

const TRIAD_WAT = `(module (import "env" "memory" (memory 1))
 (func (export "triad") (param $a i32) (param $b i32) (param $c i32) (param $bytes i32) (param $s f64)
  (local $i i32) (local $ss v128)
  (local.set $ss (f64x2.splat (local.get $s)))
  (block $done (loop $next
   (br_if $done (i32.ge_u (local.get $i) (local.get $bytes)))
   (v128.store (i32.add (local.get $a) (local.get $i))
     (f64x2.add (v128.load (i32.add (local.get $b) (local.get $i))) (f64x2.mul (local.get $ss) (v128.load (i32.add (local.get $c) (local.get $i))))))
   (v128.store offset=16 (i32.add (local.get $a) (local.get $i))
     (f64x2.add (v128.load offset=16 (i32.add (local.get $b) (local.get $i))) (f64x2.mul (local.get $ss) (v128.load offset=16 (i32.add (local.get $c) (local.get $i))))))
   (local.set $i (i32.add (local.get $i) (i32.const 32)))
   (br $next)))))`;

async function triadModule(): Promise<WebAssembly.Module> {
  const wabt = await wabtInit();
  const parsed = wabt.parseWat("triad.wat", TRIAD_WAT, { simd: true });
  parsed.validate();
  const { buffer } = parsed.toBinary({});
  parsed.destroy();
  return new WebAssembly.Module(Uint8Array.from(buffer));
}

/**
 * One thread's part: its own memory with the three arrays, the rounds started together (a barrier on a shared
 * counter), each round's seconds written to `times[round·threads + index]`.
 */
const WORKER_SOURCE = `
const { workerData, parentPort } = require("node:worker_threads");
const { module, bytes, rounds, index, threads, sync, times } = workerData;
const memory = new WebAssembly.Memory({ initial: (3 * bytes) / 65536 });
const triad = new WebAssembly.Instance(module, { env: { memory } }).exports.triad;
new Float64Array(memory.buffer).fill(1); // first touch outside the timing
const counter = new Int32Array(sync);
const out = new Float64Array(times);
for (let r = 0; r < rounds; r++) {
  // Barrier: every thread arrives, the last one releases the round.
  if (Atomics.add(counter, 0, 1) === (r + 1) * threads - 1) Atomics.notify(counter, 0);
  else while (Atomics.load(counter, 0) < (r + 1) * threads) Atomics.wait(counter, 0, Atomics.load(counter, 0), 50);
  const t = performance.now();
  triad(0, bytes, 2 * bytes, bytes, 0.5 + r);
  out[r * threads + index] = (performance.now() - t) / 1000;
}
parentPort.postMessage("done");
`;

/**
 * Triad bandwidth in bytes per second with `threads` threads running at once (each on its own three arrays): the
 * best of {@link ROUNDS} rounds of the total bytes over the slowest thread's time.
 */
export async function triadBandwidth(threads: number): Promise<number> {
  const module = await triadModule();
  const sync = new SharedArrayBuffer(4);
  const times = new SharedArrayBuffer(8 * ROUNDS * threads);
  const workers = Array.from({ length: threads }, (_, index) => new Worker(WORKER_SOURCE, {
    eval: true,
    workerData: { module, bytes: ARRAY_BYTES, rounds: ROUNDS, index, threads, sync, times },
  }));
  await Promise.all(workers.map((w) => new Promise<void>((resolve, reject) => {
    w.once("message", () => resolve());
    w.once("error", reject);
  })));
  await Promise.all(workers.map((w) => w.terminate()));
  const t = new Float64Array(times);
  let best = 0;
  for (let r = 0; r < ROUNDS; r++) {
    let slowest = 0;
    for (let h = 0; h < threads; h++) slowest = Math.max(slowest, t[r * threads + h]);
    best = Math.max(best, (3 * ARRAY_BYTES * threads) / slowest);
  }
  return best;
}
