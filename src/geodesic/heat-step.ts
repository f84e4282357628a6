/**
 * The heat step of the heat method (Crane, Weischedel & Wardetzky, "Geodesics
 * in Heat", ACM TOG 32(5), 2013, §3.2 and §3.3): u = (M + tL)⁻¹ δ under the
 * boundary mode. 'neumann' is the natural condition; 'dirichlet' fixes u on
 * the boundary; 'average' (the paper's recommendation) takes the mean of the
 * two solutions. The Dirichlet data are 0 except at boundary vertices that
 * carry source heat δ_v, held at δ_v / (M + tL)_vv (heat.ts, module comment).
 *
 * The step owns its workspaces (one per solver, so a solver in a worker
 * thread shares nothing with another).
 */
import { CholeskyFactor } from '../linalg/index.js';
import { liftDirichlet, type EdgePattern } from '../metric/laplacian.js';

/** What the heat step reads: the factors and the Dirichlet rows. */
export interface HeatStepParts {
  boundaryMode: 'average' | 'neumann' | 'dirichlet';
  /** Factor of M + tL (natural boundary condition). */
  heatN: CholeskyFactor;
  /** Factor of M + tL with the fixedD rows and columns replaced by identity, or null (no boundary, or 'neumann'). */
  heatD: CholeskyFactor | null;
  onBoundary: Uint8Array;
  vertexComponent: Int32Array;
  componentCount: number;
  /** Pattern, Laplacian values and time step t (to move the Dirichlet data to the right-hand side). */
  p: EdgePattern;
  Lv: Float64Array;
  step: number;
  /** Diagonal of M + tL before the rows were constrained. */
  heatDiag: Float64Array;
  /** Rows fixed in the Dirichlet heat step: boundary or inactive. */
  fixedD: Uint8Array;
  /** The vertices of fixedD, ascending (the step touches only these rows). */
  fixedList: Int32Array;
}

/** One heat step with its own workspaces; `run` is a bound function for heat-relay.ts. */
export class HeatStep {
  private readonly uD: Float64Array;
  private readonly rhsD: Float64Array;
  private readonly g: Float64Array;
  private readonly compMax: Float64Array;

  constructor(private readonly parts: HeatStepParts, nv: number) {
    this.uD = new Float64Array(parts.heatD ? nv : 0);
    this.rhsD = new Float64Array(parts.heatD ? nv : 0);
    this.g = new Float64Array(parts.heatD ? nv : 0);
    this.compMax = new Float64Array(parts.componentCount);
  }

  /**
   * u = (M + tL)⁻¹ rhs under the boundary mode; leaves rhs as it is. A
   * component without heat keeps the (zero) Neumann solution. The natural
   * and Dirichlet solves run as a pair (CholeskyFactor.solvePair: the
   * Dirichlet factor shares the natural one's blocks away from the boundary).
   */
  readonly run = (rhs: Float64Array, u: Float64Array): void => {
    const { heatN, heatD, onBoundary, vertexComponent: comp, boundaryMode } = this.parts;
    if (!heatD) {
      heatN.solve(rhs, u);
      return;
    }
    const nv = u.length, uD = this.uD, g = this.g, rD = this.rhsD, { fixedD, fixedList, heatDiag, p, Lv, step } = this.parts;
    rD.set(rhs);
    // data on the fixed rows only (liftDirichlet reads no other entry of g)
    let heated = false;
    for (let k = 0; k < fixedList.length; k++) {
      const v = fixedList[k]!;
      const gv = onBoundary[v] && rhs[v]! > 0 && heatDiag[v]! > 0 ? rhs[v]! / heatDiag[v]! : 0;
      g[v] = gv;
      if (gv !== 0) heated = true;
    }
    if (heated) liftDirichlet(p, Lv, step, fixedD, g, rD);
    else for (let k = 0; k < fixedList.length; k++) rD[fixedList[k]!] = 0; // zero data move nothing
    CholeskyFactor.solvePair(heatN, heatD, rhs, rD, u, uD);
    const cmax = this.compMax.fill(0);
    for (let v = 0; v < nv; v++) if (comp[v]! >= 0 && uD[v]! > cmax[comp[v]!]!) cmax[comp[v]!] = uD[v]!;
    const avg = boundaryMode === 'average';
    for (let v = 0; v < nv; v++) {
      const c = comp[v]!;
      if (c >= 0 && cmax[c]! > 0) u[v] = avg ? 0.5 * (u[v]! + uD[v]!) : uD[v]!;
    }
  };
}

/** Indices where mask is set, ascending. */
export function maskIndices(mask: Uint8Array): Int32Array {
  let n = 0;
  for (let v = 0; v < mask.length; v++) if (mask[v]) n++;
  const out = new Int32Array(n);
  for (let v = 0, k = 0; v < mask.length; v++) if (mask[v]) out[k++] = v;
  return out;
}
