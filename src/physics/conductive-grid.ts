/**
 * Depth grid of the conductive column: nodes from the lid base (z_lid) down to the bottom of the
 * domain, fine at the lid where the thermal boundary layer (thickness kappa/w) sits, growing
 * geometrically to a cap, with a node placed exactly at the adiabatic onset of melting.
 */

/** Defaults at resolution 1 (ModelOptions.conductiveResolution divides the spacings and the growth). */
export const CONDUCTIVE_GRID_DEFAULTS = {
  /** first spacing at the lid as a fraction of the boundary-layer thickness kappa/w */
  blFraction: 0.2,
  /** geometric growth of the spacing away from the lid and the onset: h_{k+1} <= h_k (1 + growth) */
  growth: 0.15,
  /** largest spacing above the adiabatic onset (where melting happens), m */
  hMeltM: 1500,
  /** largest spacing below the adiabatic onset (no melt, smooth profile), m */
  hDeepM: 5000,
  /** domain reaches this many boundary-layer thicknesses below the lid ... */
  blDepths: 15,
  /** ... and below the adiabatic onset (physics reference: z_b >= onset + 10 kappa/w) ... */
  onsetBlDepths: 10,
  /** ... and at least this far below the adiabatic onset, m */
  onsetMarginM: 10_000,
  /** below the onset the largest spacing is also allowed to reach this fraction of kappa/w */
  deepBlFraction: 0.1,
} as const;

/** What the grid must resolve. All depths in m, positive down. */
export interface ConductiveGridSpec {
  /** lid thickness (top of the grid), m */
  readonly lidM: number;
  /** depth of the onset of melting on the solid adiabat, m; NaN when the adiabat never melts */
  readonly onsetM: number;
  /** bottom of the domain, m */
  readonly bottomM: number;
  /** boundary-layer thickness kappa / w, m */
  readonly blThicknessM: number;
  /** refinement factor, 1 = default; 2 halves every spacing */
  readonly resolution: number;
}

/**
 * Bottom of the domain (m), where the sub-solidus steady solution is imposed: deep enough that the
 * boundary layer of the lid has died out (z_lid + 15 kappa/w) and, below the adiabatic onset, the
 * one of the melting region (onset + 10 kappa/w, project physics reference), and at least 10 km
 * below the onset. It may lie deeper than the model's pressure range: nothing melts down there
 * (the column is below the adiabat, which is below the solidus under the onset), so only the
 * advection-diffusion of the solid is solved.
 *
 * @param lidM lid thickness, m
 * @param onsetM depth of the adiabatic onset, m (NaN when the adiabat does not melt)
 * @param blThicknessM kappa / w, m
 */
export function conductiveBottomM(lidM: number, onsetM: number, blThicknessM: number): number {
  const d = CONDUCTIVE_GRID_DEFAULTS;
  const onset = Number.isFinite(onsetM) ? onsetM : lidM;
  return Math.max(onset + d.onsetMarginM, onset + d.onsetBlDepths * blThicknessM, lidM + d.blDepths * blThicknessM);
}

/**
 * Node depths (m), strictly increasing from spec.lidM to spec.bottomM.
 * Spacing: h(z) = min(h0 + growth (z - z_lid), cap(z)), h0 = blFraction kappa/w, where cap is
 * hMeltM above the onset and grows geometrically from hMeltM at the onset (at the lid when the
 * adiabat does not melt) to max(hDeepM, deepBlFraction kappa/w) below it.
 * Each segment (lid -> onset -> bottom) is marched with h(z) and then stretched to end exactly
 * on its end point.
 */
export function buildConductiveGrid(spec: ConductiveGridSpec): Float64Array {
  const d = CONDUCTIVE_GRID_DEFAULTS;
  const res = spec.resolution > 0 ? spec.resolution : 1;
  const growth = d.growth / res;
  const hMelt = d.hMeltM / res;
  // below the onset the profile is smooth on the scale kappa/w, which may be hundreds of km
  const hDeep = Math.max(d.hDeepM, d.deepBlFraction * spec.blThicknessM) / res;
  const h0 = Math.min(hMelt, (d.blFraction * spec.blThicknessM) / res);
  const top = spec.lidM;
  const bottom = spec.bottomM;
  const onset = spec.onsetM > top && spec.onsetM < bottom ? spec.onsetM : NaN;
  // below the onset (or everywhere when the adiabat does not melt) no melting can happen
  const deepFrom = Number.isFinite(onset) ? onset : top;
  const spacing = (z: number): number => {
    let cap = hMelt;
    if (z > deepFrom) cap = Math.min(hDeep, hMelt + growth * (z - deepFrom));
    const bl = h0 + growth * (z - top);
    return bl < cap ? bl : cap;
  };
  const nodes: number[] = [top];
  const march = (from: number, to: number): void => {
    const start = nodes.length;
    let z = from;
    for (;;) {
      const h = spacing(z);
      if (z + 1.5 * h >= to) break;
      z += h;
      nodes.push(z);
    }
    nodes.push(to);
    // stretch the marched nodes so the last gap is not a sliver
    const marchedEnd = nodes.length >= start + 2 ? nodes[nodes.length - 2] + spacing(nodes[nodes.length - 2]) : to;
    const scale = (to - from) / (marchedEnd - from);
    for (let k = start; k < nodes.length - 1; k++) nodes[k] = from + (nodes[k] - from) * scale;
  };
  if (Number.isFinite(onset)) {
    march(top, onset);
    march(onset, bottom);
  } else {
    march(top, bottom);
  }
  return Float64Array.from(nodes);
}
