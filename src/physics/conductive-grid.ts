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
  /** ... and at least this far below the adiabatic onset, m */
  onsetMarginM: 10_000,
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
 * Bottom of the domain (m): deep enough that the boundary layer has died out
 * (z_lid + 15 kappa/w) and at least 10 km below the adiabatic onset, but no deeper than capM
 * (the model's pressure range); always at least 1 km below the onset and the lid.
 */
export function conductiveBottomM(lidM: number, onsetM: number, blThicknessM: number, capM: number): number {
  const d = CONDUCTIVE_GRID_DEFAULTS;
  const onset = Number.isFinite(onsetM) ? onsetM : lidM;
  const wanted = Math.max(onset + d.onsetMarginM, lidM + d.blDepths * blThicknessM);
  return Math.max(Math.min(wanted, capM), onset + 1000, lidM + 1000);
}

/**
 * Node depths (m), strictly increasing from spec.lidM to spec.bottomM.
 * Spacing: h(z) = min(h0 + growth (z - z_lid), cap(z)), h0 = blFraction kappa/w, where cap is
 * hMeltM above the onset and grows geometrically from hMeltM at the onset to hDeepM below it.
 * Each segment (lid -> onset -> bottom) is marched with h(z) and then stretched to end exactly
 * on its end point.
 */
export function buildConductiveGrid(spec: ConductiveGridSpec): Float64Array {
  const d = CONDUCTIVE_GRID_DEFAULTS;
  const res = spec.resolution > 0 ? spec.resolution : 1;
  const growth = d.growth / res;
  const hMelt = d.hMeltM / res;
  const hDeep = d.hDeepM / res;
  const h0 = Math.min(hMelt, (d.blFraction * spec.blThicknessM) / res);
  const top = spec.lidM;
  const bottom = spec.bottomM;
  const onset = spec.onsetM > top && spec.onsetM < bottom ? spec.onsetM : NaN;
  const spacing = (z: number): number => {
    let cap = hMelt;
    if (Number.isFinite(onset) && z > onset) cap = Math.min(hDeep, hMelt + growth * (z - onset));
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
