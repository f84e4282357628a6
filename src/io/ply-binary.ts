/**
 * Binary PLY body readers (layout in ply.ts): one scalar by type code, a
 * fixed-stride column, and the common face element holding only its index
 * list. Bounds: callers check fixed-size blocks against the file length
 * first; {@link readFaceLists} checks every list against the bytes left
 * before reading or growing anything by its length.
 */
import { inputError } from '../errors.js';
import { TYPE_SIZES } from './ply-header.js';
import type { PlyProperty } from './ply-header.js';

/** One binary scalar of type code `t` at byte `o`. */
export function rd(dv: DataView, o: number, t: number, le: boolean): number {
  switch (t) {
    case 0: return dv.getInt8(o);
    case 1: return dv.getUint8(o);
    case 2: return dv.getInt16(o, le);
    case 3: return dv.getUint16(o, le);
    case 4: return dv.getInt32(o, le);
    case 5: return dv.getUint32(o, le);
    case 6: return dv.getFloat32(o, le);
    default: return dv.getFloat64(o, le);
  }
}

/** Reads `count` values of type `t` spaced `stride` bytes apart from `o` into `dst[i * ds + base]`. */
export function readColumn(dv: DataView, o: number, stride: number, count: number, t: number, le: boolean, dst: Float64Array, ds: number, base: number): void {
  let d = base;
  switch (t) {
    case 6:
      for (let i = 0; i < count; i++, o += stride, d += ds) dst[d] = dv.getFloat32(o, le);
      return;
    case 7:
      for (let i = 0; i < count; i++, o += stride, d += ds) dst[d] = dv.getFloat64(o, le);
      return;
    default:
      for (let i = 0; i < count; i++, o += stride, d += ds) dst[d] = rd(dv, o, t, le);
  }
}

/** Position and output of {@link readFaceLists}. */
export interface FaceLists { p: number; ni: number; idx: Uint32Array }

/**
 * Reads `count` binary faces that hold only their index list `q`, from
 * `st.p`, appending indices to `st.idx` (grown when needed) and ends to
 * `offsets`. A function of its own, so it is optimized as a whole rather
 * than mid-loop inside the caller.
 */
export function readFaceLists(dv: DataView, b: Uint8Array, st: FaceLists, count: number, q: PlyProperty, le: boolean, nv: number, offsets: Uint32Array, name: string): void {
  const n = b.length, ct = q.countType, it = q.type;
  const cs = TYPE_SIZES[ct]!, is = TYPE_SIZES[it]!;
  const fast = ct === 1 && (it === 4 || it === 5);
  let p = st.p, ni = st.ni, idx = st.idx;
  const fail = (f: number, msg: string): never => {
    throw inputError(msg, `${name}: face ${f}`);
  };
  for (let f = 0; f < count; f++) {
    if (p + cs > n) fail(f, 'file ends inside this item');
    const k = ct === 1 ? b[p]! : rd(dv, p, ct, le);
    p += cs;
    if (!(k >= 3)) fail(f, `face has ${k} ${k === 1 ? 'vertex' : 'vertices'} (at least 3 needed)`);
    const e = p + k * is;
    if (e > n) fail(f, 'file ends inside this item');
    if (ni + k > idx.length) {
      const g = new Uint32Array(Math.max(2 * idx.length, ni + k));
      g.set(idx.subarray(0, ni));
      idx = g;
    }
    if (fast) {
      // int and uint alike: a negative int reads as ≥ 2^31, out of range too.
      for (; p < e; p += 4) {
        const v = dv.getUint32(p, le);
        if (v >= nv) fail(f, `vertex index ${it === 4 ? dv.getInt32(p, le) : v} out of range (the file has ${nv} vertices)`);
        idx[ni++] = v;
      }
    } else {
      for (; p < e; p += is) {
        const v = rd(dv, p, it, le);
        if (!(v >= 0 && v < nv && Number.isInteger(v))) fail(f, `vertex index ${v} out of range (the file has ${nv} vertices)`);
        idx[ni++] = v;
      }
    }
    offsets[f + 1] = ni;
  }
  st.p = p;
  st.ni = ni;
  st.idx = idx;
}
