/**
 * Welding coincident points: the corners of a triangle soup (an STL file
 * stores every facet's three corners on their own) become shared vertices,
 * so the mesh gets shared edges and a boundary.
 *
 * Rule: a point joins the nearest vertex kept so far that lies within the
 * tolerance r (Euclidean distance ≤ r; ties to the lower index), else it
 * becomes a new vertex at its own position; points are taken in input order.
 * Kept vertices are therefore pairwise more than r apart, and a point moves
 * by at most r. Welding is greedy, not transitive: of three points spaced
 * 0.6·r apart in a row, the first two merge and the third joins them only if
 * it lies within r of the first.
 *
 * Default tolerance: {@link WELD_RELATIVE_TOLERANCE} × the diagonal of the
 * points' bounding box. It scales with the part (its units do not matter) and
 * sits far above float64 rounding of coordinates (≈ 1e-16 relative), so the
 * same point written twice, or transformed twice, welds; and far below any
 * real feature (1 nm on a 1 m part), so two distinct points of a part never
 * weld. Binary STL stores float32 coordinates: exporters write a shared
 * corner with the same bits, which welds at any tolerance, but copies that
 * were rounded on different paths can differ by a float32 step (≈ 6e-8 of
 * the coordinate's magnitude) and then stay apart by default: they are
 * reported as near pairs, and a larger tolerance welds them.
 *
 * Near pairs: pairs of kept vertices closer than {@link NEAR_FACTOR} × the
 * tolerance, counted so that a gap just beyond the tolerance is not silent.
 *
 * Cost: a spatial hash on a grid of cells 2r wide (a point's neighbours
 * within r lie in the 2 × 2 × 2 cells nearest to it), so each point probes
 * at most 8 cells, after a first probe of its own cell for an exact copy (the
 * common case in STL). Kept vertices are more than r apart, so a cell holds a
 * bounded number of them: linear expected time. The near-pair pass uses
 * cells of the near radius; a cell of it can hold many kept vertices in an
 * extremely dense region, so that pass stops after {@link NEAR_WORK} × n
 * distance checks and then reports the count as unknown (null).
 * (Hashed grids for proximity queries: common practice.)
 */

/** Default weld tolerance as a fraction of the bounding-box diagonal (see the module comment). */
export const WELD_RELATIVE_TOLERANCE = 1e-9;
/** Kept vertices closer than this many tolerances are reported as near pairs. */
export const NEAR_FACTOR = 1000;
/** The near-pair pass gives up (count null) after this many distance checks per vertex on average. */
export const NEAR_WORK = 64;
/**
 * Cells are this much wider than twice the radius, so rounding in a cell
 * index never loses a neighbour: the index of a point is (x − min)/w with a
 * rounding error below 2.2e-16 × diagonal / w cells, under the slack of
 * 0.5e-3 cells while the tolerance is above ~1e-12 of the diagonal (below
 * that, a pair at almost exactly the tolerance may stay apart).
 */
const CELL_MARGIN = 1 + 1e-3;

/** A pair of kept vertices closer than the near radius but beyond the tolerance. */
export interface NearPair {
  /** The lower vertex index. */
  a: number;
  /** The higher vertex index. */
  b: number;
  /** Their distance, in mesh units. */
  distance: number;
}

/** Result of {@link weldPoints}. */
export interface WeldResult {
  /** Kept vertices, x, y, z each (each at the position of the first point that made it). */
  positions: Float64Array;
  /** For every input point, its vertex. */
  index: Uint32Array;
  /** The tolerance used, in mesh units. */
  tolerance: number;
  /** Input points merged into an earlier vertex: points − vertices. */
  merged: number;
  /** Radius of the near-pair check: {@link NEAR_FACTOR} × the tolerance (with tolerance 0, × the default one). */
  nearRadius: number;
  /** Pairs of vertices with tolerance < distance ≤ nearRadius; null when the check gave up (see NEAR_WORK). */
  nearPairs: number | null;
  /** The first such pair (by the higher vertex index), or null. */
  firstNearPair: NearPair | null;
}

/** Diagonal of the bounding box of the points (0 for none). */
export function boundingDiagonal(points: Float64Array): number {
  if (points.length < 3) return 0;
  let x0 = Infinity, y0 = Infinity, z0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity;
  for (let i = 0; i < points.length; i += 3) {
    const x = points[i]!, y = points[i + 1]!, z = points[i + 2]!;
    if (x < x0) x0 = x;
    if (x > x1) x1 = x;
    if (y < y0) y0 = y;
    if (y > y1) y1 = y;
    if (z < z0) z0 = z;
    if (z > z1) z1 = z;
  }
  return Math.hypot(x1 - x0, y1 - y0, z1 - z0);
}

/**
 * A hash of grid cells to the vertices in them (a linked list per cell).
 * A cell is identified by its integer coordinates, recomputed from the
 * position of its first vertex (no cell coordinates are stored).
 */
class CellHash {
  private table: Int32Array;
  private used = 0;
  /** Next vertex in the same cell, −1 at the end. */
  readonly next: Int32Array;
  private readonly inv: number;

  constructor(
    private readonly pos: Float64Array,
    capacityHint: number,
    cell: number,
    private readonly ox: number,
    private readonly oy: number,
    private readonly oz: number,
  ) {
    let cap = 16;
    while (cap < 2 * capacityHint) cap *= 2;
    this.table = new Int32Array(cap).fill(-1);
    this.next = new Int32Array(pos.length / 3).fill(-1);
    this.inv = 1 / cell;
  }

  /** Cell coordinate of a value along the axis with origin o. */
  coord(x: number, o: number): number {
    return Math.floor((x - o) * this.inv);
  }

  /** +1 when the value lies in the upper half of its cell along the axis with origin o, else −1. */
  side(x: number, o: number): number {
    const f = (x - o) * this.inv;
    return f - Math.floor(f) >= 0.5 ? 1 : -1;
  }

  private static hash(ix: number, iy: number, iz: number): number {
    let h = Math.imul(ix | 0, 0x9e3779b1) ^ Math.imul(iy | 0, 0x85ebca77) ^ Math.imul(iz | 0, 0xc2b2ae3d);
    h ^= h >>> 15;
    h = Math.imul(h, 0x2c1b3c6d);
    return h ^ (h >>> 12);
  }

  /** Slot of cell (ix, iy, iz): its head vertex is table[slot], or −1 if the cell is empty. */
  private slot(ix: number, iy: number, iz: number): number {
    const { table, pos, ox, oy, oz } = this;
    const mask = table.length - 1;
    let s = CellHash.hash(ix, iy, iz) & mask;
    for (;;) {
      const v = table[s]!;
      if (v < 0) return s;
      if (this.coord(pos[3 * v]!, ox) === ix && this.coord(pos[3 * v + 1]!, oy) === iy && this.coord(pos[3 * v + 2]!, oz) === iz) return s;
      s = (s + 1) & mask;
    }
  }

  /** First vertex of cell (ix, iy, iz), −1 if none. */
  head(ix: number, iy: number, iz: number): number {
    return this.table[this.slot(ix, iy, iz)]!;
  }

  /** Adds vertex v (its position already in `pos`) to its cell. */
  insert(v: number): void {
    const { pos } = this;
    const ix = this.coord(pos[3 * v]!, this.ox), iy = this.coord(pos[3 * v + 1]!, this.oy), iz = this.coord(pos[3 * v + 2]!, this.oz);
    const s = this.slot(ix, iy, iz);
    const h = this.table[s]!;
    if (h >= 0) {
      // keep the head (it names the cell); v goes second
      this.next[v] = this.next[h]!;
      this.next[h] = v;
      return;
    }
    this.table[s] = v;
    if (++this.used * 2 > this.table.length) this.grow();
  }

  private grow(): void {
    const old = this.table;
    this.table = new Int32Array(2 * old.length).fill(-1);
    const { pos } = this;
    for (const v of old) {
      if (v < 0) continue;
      const s = this.slot(this.coord(pos[3 * v]!, this.ox), this.coord(pos[3 * v + 1]!, this.oy), this.coord(pos[3 * v + 2]!, this.oz));
      this.table[s] = v;
    }
  }
}

/**
 * Welds the points (x, y, z each) within `tolerance` (mesh units; default
 * {@link WELD_RELATIVE_TOLERANCE} × the bounding-box diagonal; 0 welds exact
 * copies only). Coordinates must be finite, the tolerance finite and ≥ 0
 * (the caller validates).
 */
export function weldPoints(points: Float64Array, tolerance?: number): WeldResult {
  const n = points.length / 3;
  const diag = boundingDiagonal(points);
  const r = tolerance ?? WELD_RELATIVE_TOLERANCE * diag;
  let ox = Infinity, oy = Infinity, oz = Infinity;
  for (let i = 0; i < points.length; i += 3) {
    if (points[i]! < ox) ox = points[i]!;
    if (points[i + 1]! < oy) oy = points[i + 1]!;
    if (points[i + 2]! < oz) oz = points[i + 2]!;
  }
  const fallbackCell = diag > 0 ? diag * 1e-6 : 1;
  const kept = new Float64Array(points.length);
  const index = new Uint32Array(n);
  const grid = new CellHash(kept, Math.max(16, n >> 2), r > 0 ? 2 * r * CELL_MARGIN : fallbackCell, ox, oy, oz);
  const r2 = r * r;
  let nk = 0;
  for (let i = 0; i < n; i++) {
    const x = points[3 * i]!, y = points[3 * i + 1]!, z = points[3 * i + 2]!;
    const fx = grid.coord(x, ox), fy = grid.coord(y, oy), fz = grid.coord(z, oz);
    // an exact copy in the point's own cell
    let found = -1;
    for (let v = grid.head(fx, fy, fz); v >= 0; v = grid.next[v]!) {
      if (kept[3 * v] === x && kept[3 * v + 1] === y && kept[3 * v + 2] === z) {
        found = v;
        break;
      }
    }
    if (found < 0 && r > 0) found = nearestWithin(grid, kept, x, y, z, ox, oy, oz, r2);
    if (found >= 0) {
      index[i] = found;
      continue;
    }
    kept[3 * nk] = x;
    kept[3 * nk + 1] = y;
    kept[3 * nk + 2] = z;
    grid.insert(nk);
    index[i] = nk++;
  }
  const positions = kept.slice(0, 3 * nk);
  const nearRadius = NEAR_FACTOR * (r > 0 ? r : WELD_RELATIVE_TOLERANCE * diag);
  const near = nearRadius > 0 ? nearPairsOf(positions, r, nearRadius, ox, oy, oz) : { count: 0, first: null };
  return { positions, index, tolerance: r, merged: n - nk, nearRadius, nearPairs: near.count, firstNearPair: near.first };
}

/**
 * The nearest kept vertex within distance √r2 of (x, y, z), ties to the lower
 * index, or −1. Searches the 2 × 2 × 2 cells nearest to the point: with cells
 * wider than 2r, one neighbour cell per axis (below or above, by the half of
 * its cell the point is in) covers everything within r.
 */
function nearestWithin(grid: CellHash, kept: Float64Array, x: number, y: number, z: number, ox: number, oy: number, oz: number, r2: number): number {
  const cx = grid.coord(x, ox), cy = grid.coord(y, oy), cz = grid.coord(z, oz);
  const sx = grid.side(x, ox); // upper half of its cell: look above, else below
  const sy = grid.side(y, oy);
  const sz = grid.side(z, oz);
  let best = -1, bestD2 = Infinity;
  for (let a = 0; a < 2; a++) {
    for (let b = 0; b < 2; b++) {
      for (let c = 0; c < 2; c++) {
        for (let v = grid.head(cx + a * sx, cy + b * sy, cz + c * sz); v >= 0; v = grid.next[v]!) {
          const dx = kept[3 * v]! - x, dy = kept[3 * v + 1]! - y, dz = kept[3 * v + 2]! - z;
          const d2 = dx * dx + dy * dy + dz * dz;
          if (d2 <= r2 && (d2 < bestD2 || (d2 === bestD2 && v < best))) {
            best = v;
            bestD2 = d2;
          }
        }
      }
    }
  }
  return best;
}

/**
 * Pairs of vertices with r < distance ≤ R (in index order: each vertex is
 * checked against the earlier ones near it). Gives up with count null after
 * NEAR_WORK × n distance checks.
 */
function nearPairsOf(pos: Float64Array, r: number, R: number, ox: number, oy: number, oz: number): { count: number | null; first: NearPair | null } {
  const n = pos.length / 3;
  const grid = new CellHash(pos, Math.max(16, n), 2 * R * CELL_MARGIN, ox, oy, oz);
  const r2 = r * r, R2 = R * R;
  const budget = NEAR_WORK * n + 1e6;
  let work = 0, count = 0;
  let first: NearPair | null = null;
  for (let v = 0; v < n; v++) {
    const x = pos[3 * v]!, y = pos[3 * v + 1]!, z = pos[3 * v + 2]!;
    const cx = grid.coord(x, ox), cy = grid.coord(y, oy), cz = grid.coord(z, oz);
    const sx = grid.side(x, ox);
    const sy = grid.side(y, oy);
    const sz = grid.side(z, oz);
    for (let a = 0; a < 2; a++) {
      for (let b = 0; b < 2; b++) {
        for (let c = 0; c < 2; c++) {
          for (let u = grid.head(cx + a * sx, cy + b * sy, cz + c * sz); u >= 0; u = grid.next[u]!) {
            if (++work > budget) return { count: null, first };
            const dx = pos[3 * u]! - x, dy = pos[3 * u + 1]! - y, dz = pos[3 * u + 2]! - z;
            const d2 = dx * dx + dy * dy + dz * dz;
            if (d2 > r2 && d2 <= R2) {
              count++;
              if (first === null) first = { a: u, b: v, distance: Math.sqrt(d2) };
            }
          }
        }
      }
    }
    grid.insert(v);
  }
  return { count, first };
}
