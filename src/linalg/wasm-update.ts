/**
 * A WebAssembly SIMD version of the 4×2-tile part of the trailing update
 * (see `trailingUpdate` in dense-kernels.ts), assembled from bytes here so no
 * build step or file is needed. It runs on a frontal matrix that lives in a
 * WebAssembly.Memory, handles rows i .. i+3 (i = c0, c0+4, …, below
 * c0+4q) against columns c0 .. i+3 (so the 4×4 diagonal block is computed
 * whole; its upper half lies in F's unused upper triangle), or up to a
 * column limit jEnd for the panel updates, and an even number of k, using
 * f64x2 lanes: two k at a time,
 *
 *   acc(a,b) += F[i+a][k:k+2] ⊙ F[j+b][k:k+2],   F[i+a][j+b] −= lane0 + lane1.
 *
 * Where the engine has relaxed SIMD (WebAssembly relaxed-simd proposal,
 * now in the core specification 3.0: f64x2.relaxed_madd, opcode 0xFD 0x107,
 * "a·b + c with one rounding or two"), the accumulation is one fused
 * multiply-add: measured on a 1500-row front 13.0 → 17.1 GFlop/s, because a
 * core without fused operations spends one port cycle on each multiply and
 * each add. Node 20's V8 has the instruction behind a flag, which
 * `relaxedSimd()` turns on for the process (the V8 API
 * `v8.setFlagsFromString`; it only adds instructions); browsers that ship it
 * need nothing. A fused module is used only when it passes a check against
 * the unfused one on a test front (`fusedAgrees`); a fused kernel rounds
 * differently, so factors are identical run to run on one machine, not
 * between a machine with fused operations and one without.
 * Where WebAssembly SIMD is missing, `createSimdFront` returns null and the
 * plain kernels are used.
 */

/** A front workspace in WebAssembly memory plus the SIMD tile update over it. */
export interface SimdFront {
  /** The frontal matrix storage (a view of the module's memory). */
  readonly front: Float64Array;
  /**
   * F(i, j) −= Σ_{k0 ≤ k < k0+2·pairs} F(i, k) F(j, k) for the 4×2 tiles:
   * i in [c0, c0 + 4⌊(nr−c0)/4⌋), c0 ≤ j < min(start of i's group of four
   * + 4, jEnd); jEnd − c0 must be even. Entries above the diagonal of the
   * groups' 4×4 blocks are overwritten with meaningless values.
   */
  tiles(nr: number, c0: number, k0: number, pairs: number, jEnd: number): void;
}

// --- a minimal assembler -----------------------------------------------------
//
// Byte values from the WebAssembly Core Specification, release 2.0, §5
// "Binary Format" (5.3 types, 5.4 instructions incl. 5.4.8 vector
// instructions, 5.5 modules and sections); LEB128 integers as in §5.2.2.

/** Module preamble: magic "\0asm" and version 1 (§5.5.16). */
const MAGIC = [0x00, 0x61, 0x73, 0x6d], VERSION = [0x01, 0x00, 0x00, 0x00];
/** Section ids (§5.5.2). */
const SEC_TYPE = 1, SEC_IMPORT = 2, SEC_FUNCTION = 3, SEC_EXPORT = 7, SEC_CODE = 10;
/** Types (§5.3): value types, the function type tag, the empty block type. */
const T_I32 = 0x7f, T_V128 = 0x7b, T_FUNC = 0x60, BLOCK_EMPTY = 0x40;
/** Import / export descriptors (§5.5.5, §5.5.10) and memory limits flag "min only" (§5.3.7). */
const DESC_FUNC = 0x00, DESC_MEM = 0x02, LIMITS_MIN = 0x00;
/** Control instructions (§5.4.1). */
const OP_BLOCK = 0x02, OP_LOOP = 0x03, OP_BR = 0x0c, OP_BR_IF = 0x0d, OP_END = 0x0b, OP_SELECT = 0x1b;
/** Variable instructions (§5.4.4). */
const OP_LOCAL_GET = 0x20, OP_LOCAL_SET = 0x21;
/** Memory instructions (§5.4.6). */
const OP_F64_LOAD = 0x2b, OP_F64_STORE = 0x39;
/** Numeric instructions (§5.4.7). */
const OP_I32_CONST = 0x41, OP_I32_LT_S = 0x48, OP_I32_GE_S = 0x4e, OP_I32_ADD = 0x6a, OP_I32_MUL = 0x6c;
const OP_F64_ADD = 0xa0, OP_F64_SUB = 0xa1;
/** Vector instructions (§5.4.8): prefix 0xFD, then a LEB128 sub-opcode. */
const PREFIX_SIMD = 0xfd;
/** Relaxed SIMD (core specification 3.0, §5.4.8): f64x2.relaxed_madd(a, b, c) = a·b + c. */
const SIMD_F64X2_RELAXED_MADD = 0x107;
const SIMD_V128_LOAD = 0x00, SIMD_V128_CONST = 0x0c, SIMD_F64X2_EXTRACT_LANE = 0x21, SIMD_F64X2_ADD = 0xf0, SIMD_F64X2_MUL = 0xf2;
/** memarg alignment exponent 3: 8-byte aligned (§5.4.6). */
const ALIGN_8 = 3;

function uleb(n: number, out: number[]): void {
  do {
    let b = n & 0x7f;
    n >>>= 7;
    if (n !== 0) b |= 0x80;
    out.push(b);
  } while (n !== 0);
}
function sleb(n: number, out: number[]): void {
  for (;;) {
    const b = n & 0x7f;
    n >>= 7;
    if ((n === 0 && (b & 0x40) === 0) || (n === -1 && (b & 0x40) !== 0)) {
      out.push(b);
      return;
    }
    out.push(b | 0x80);
  }
}
function section(id: number, body: number[], out: number[]): void {
  out.push(id);
  uleb(body.length, out);
  out.push(...body);
}

// locals: params first (i32): base nr c0 k0 pairs jend; then i32 scratch, then v128 accumulators
const P_BASE = 0, P_NR = 1, P_C0 = 2, P_K0 = 3, P_PAIRS = 4, P_JEND = 5;
const I = 6, J = 7, OFF = 8, KEND = 9, RB = 10, K0B = 11, ADDR = 12;
const R0 = 13; // R0..R3 row starts (+k0) of rows i..i+3
const S0 = 17; // S0..S3 row starts of rows i..i+3 (for stores)
const Q0 = 21, Q1 = 22, J8 = 23, JL = 24;
const NI32 = 25 - 6;
const ACC = 25; // 8 accumulators
const VA = 33; // a0..a3, b0, b1
const NV128 = 8 + 6;

function body(fused: boolean): number[] {
  const c: number[] = [];
  const op = (...b: number[]) => c.push(...b);
  const get = (l: number) => (op(OP_LOCAL_GET), uleb(l, c));
  const set = (l: number) => (op(OP_LOCAL_SET), uleb(l, c));
  const i32 = (v: number) => (op(OP_I32_CONST), sleb(v, c));
  const add = () => op(OP_I32_ADD);
  const mul = () => op(OP_I32_MUL);
  const geS = () => op(OP_I32_GE_S);
  const simd = (code: number) => (op(PREFIX_SIMD), uleb(code, c));
  const memarg = (offset: number) => (op(ALIGN_8), uleb(offset, c));
  const v128load = (offset: number) => (simd(SIMD_V128_LOAD), memarg(offset));
  const lane = (l: number) => (simd(SIMD_F64X2_EXTRACT_LANE), op(l));
  const blockLoop = () => op(OP_BLOCK, BLOCK_EMPTY, OP_LOOP, BLOCK_EMPTY);
  const breakIf = () => op(OP_BR_IF, 1); // leave the enclosing block
  const continueLoop = () => op(OP_BR, 0, OP_END, OP_END); // back to the loop head; end loop, end block

  // RB = nr*8 ; K0B = k0*8 ; KEND = pairs*16
  get(P_NR), i32(8), mul(), set(RB);
  get(P_K0), i32(8), mul(), set(K0B);
  get(P_PAIRS), i32(16), mul(), set(KEND);
  get(P_C0), set(I);
  blockLoop(); // loop i
  //   if (i + 3 >= nr) break
  get(I), i32(3), add(), get(P_NR), geS(), breakIf();
  //   S0 = base + i*RB ; S1..S3 ; R_a = S_a + K0B
  get(P_BASE), get(I), get(RB), mul(), add(), set(S0);
  for (let a = 1; a < 4; a++) get(S0 + a - 1), get(RB), add(), set(S0 + a);
  for (let a = 0; a < 4; a++) get(S0 + a), get(K0B), add(), set(R0 + a);
  //   JL = min(i + 4, jend): the group's own 4×4 diagonal block is two full tiles
  get(I), i32(4), add(), set(JL);
  get(JL), get(P_JEND), get(JL), get(P_JEND), op(OP_I32_LT_S), op(OP_SELECT), set(JL);
  get(P_C0), set(J);
  blockLoop(); // loop j
  //     if (j >= JL) break
  get(J), get(JL), geS(), breakIf();
  //     J8 = j*8 ; Q0 = base + j*RB + K0B ; Q1 = Q0 + RB
  get(J), i32(8), mul(), set(J8);
  get(P_BASE), get(J), get(RB), mul(), add(), get(K0B), add(), set(Q0);
  get(Q0), get(RB), add(), set(Q1);
  for (let t = 0; t < 8; t++) simd(SIMD_V128_CONST), op(...new Array(16).fill(0)), set(ACC + t);
  i32(0), set(OFF);
  blockLoop(); // loop k
  get(OFF), get(KEND), geS(), breakIf();
  get(Q0), get(OFF), add(), v128load(0), set(VA + 4);
  get(Q1), get(OFF), add(), v128load(0), set(VA + 5);
  for (let a = 0; a < 4; a++) get(R0 + a), get(OFF), add(), v128load(0), set(VA + a);
  for (let a = 0; a < 4; a++) {
    for (let b = 0; b < 2; b++) {
      const acc = ACC + 2 * a + b;
      if (fused) get(VA + a), get(VA + 4 + b), get(acc), simd(SIMD_F64X2_RELAXED_MADD), set(acc); // acc = a ⊙ b + acc
      else get(acc), get(VA + a), get(VA + 4 + b), simd(SIMD_F64X2_MUL), simd(SIMD_F64X2_ADD), set(acc); // acc += a ⊙ b
    }
  }
  get(OFF), i32(16), add(), set(OFF);
  continueLoop(); // loop k
  //     F[i+a][j+b] −= lane0(acc) + lane1(acc)
  for (let a = 0; a < 4; a++) {
    for (let b = 0; b < 2; b++) {
      const acc = ACC + 2 * a + b;
      get(S0 + a), get(J8), add(), set(ADDR);
      get(ADDR);
      get(ADDR), op(OP_F64_LOAD), memarg(8 * b);
      get(acc), lane(0), get(acc), lane(1), op(OP_F64_ADD);
      op(OP_F64_SUB);
      op(OP_F64_STORE), memarg(8 * b);
    }
  }
  get(J), i32(2), add(), set(J);
  continueLoop(); // loop j
  get(I), i32(4), add(), set(I);
  continueLoop(); // loop i
  op(OP_END); // end function
  return c;
}

function moduleBytes(fused: boolean): Uint8Array<ArrayBuffer> {
  const out: number[] = [...MAGIC, ...VERSION];
  section(SEC_TYPE, [1, T_FUNC, 6, T_I32, T_I32, T_I32, T_I32, T_I32, T_I32, 0], out); // one type: (i32 ×6) → ()
  const imp: number[] = [1];
  for (const s of ['env', 'mem']) {
    uleb(s.length, imp);
    for (const ch of s) imp.push(ch.charCodeAt(0));
  }
  imp.push(DESC_MEM, LIMITS_MIN, 1); // memory, min 1 page, no max
  section(SEC_IMPORT, imp, out);
  section(SEC_FUNCTION, [1, 0], out); // one function of type 0
  const exp: number[] = [1, 5, ...Array.from('tiles', (ch) => ch.charCodeAt(0)), DESC_FUNC, 0];
  section(SEC_EXPORT, exp, out);
  const fn: number[] = [];
  uleb(2, fn); // two local groups
  uleb(NI32, fn), fn.push(T_I32);
  uleb(NV128, fn), fn.push(T_V128);
  fn.push(...body(fused));
  const code: number[] = [1];
  uleb(fn.length, code);
  code.push(...fn);
  section(SEC_CODE, code, out);
  return new Uint8Array(out);
}

let compiled: WebAssembly.Module | null | undefined;
let fusedInUse = false;

/**
 * Whether this engine validates relaxed SIMD, after asking V8 for it where the
 * process can (Node: `v8.setFlagsFromString`, through process.getBuiltinModule
 * so browser bundles do not import node:v8). Never throws.
 */
function relaxedSimd(bytes: Uint8Array<ArrayBuffer>): boolean {
  if (WebAssembly.validate(bytes)) return true;
  try {
    const proc = (globalThis as { process?: { getBuiltinModule?: (id: string) => unknown } }).process;
    const v8 = proc?.getBuiltinModule?.('node:v8') as { setFlagsFromString?: (flags: string) => void } | undefined;
    v8?.setFlagsFromString?.('--experimental-wasm-relaxed-simd');
  } catch {
    return false;
  }
  return WebAssembly.validate(bytes);
}

/**
 * Runs both modules' tiles on one test front (rows 8 × 8 against k = 0 … 15,
 * values of mixed sign and size) and compares: each entry within 1e-13 of the
 * column's scale. Guards against an engine whose fused instruction is wrong.
 */
function fusedAgrees(fused: WebAssembly.Module, plain: WebAssembly.Module): boolean {
  const nr = 24, out: Float64Array[] = [];
  for (const mod of [fused, plain]) {
    const mem = new WebAssembly.Memory({ initial: 1 });
    const fn = new WebAssembly.Instance(mod, { env: { mem } }).exports.tiles as (base: number, nr: number, c0: number, k0: number, pairs: number, jEnd: number) => void;
    const F = new Float64Array(mem.buffer, 0, nr * nr);
    for (let i = 0; i < nr * nr; i++) F[i] = Math.sin(1 + i * 0.7) * (1 + (i % 5));
    fn(0, nr, 16, 0, 8, nr);
    out.push(F.slice());
  }
  for (let i = 0; i < nr * nr; i++) if (!(Math.abs(out[0]![i]! - out[1]![i]!) <= 1e-13 * 40)) return false;
  return true;
}

function simdModule(): WebAssembly.Module | null {
  if (compiled !== undefined) return compiled;
  compiled = null;
  try {
    if (typeof WebAssembly === 'object') {
      const bytes = moduleBytes(false);
      if (WebAssembly.validate(bytes)) {
        compiled = new WebAssembly.Module(bytes);
        const fusedBytes = moduleBytes(true);
        if (relaxedSimd(fusedBytes)) {
          const fused = new WebAssembly.Module(fusedBytes);
          if (fusedAgrees(fused, compiled)) {
            compiled = fused;
            fusedInUse = true;
          }
        }
      }
    }
  } catch {
    // keep the unfused module, or none
  }
  return compiled;
}

/** Whether the tile kernel has fused multiply-adds on this engine (compiles the module on first call). */
export function simdFused(): boolean {
  simdModule();
  return fusedInUse;
}

/** Largest front (in doubles) placed in WebAssembly memory: 1 GiB. */
const MAX_DOUBLES = 2 ** 27;

/**
 * A front workspace of `doubles` entries with the SIMD tile kernel, or null
 * when WebAssembly SIMD is unavailable or the front is too large.
 */
export function createSimdFront(doubles: number): SimdFront | null {
  const mod = simdModule();
  if (!mod || doubles > MAX_DOUBLES) return null;
  const pages = Math.max(1, Math.ceil((doubles * 8) / 65536));
  const mem = new WebAssembly.Memory({ initial: pages });
  const inst = new WebAssembly.Instance(mod, { env: { mem } });
  const fn = inst.exports.tiles as (base: number, nr: number, c0: number, k0: number, pairs: number, jEnd: number) => void;
  return {
    front: new Float64Array(mem.buffer, 0, Math.max(1, doubles)),
    tiles: (nr, c0, k0, pairs, jEnd) => fn(0, nr, c0, k0, pairs, jEnd),
  };
}
