/**
 * Vega-Lite -> SVG in Node: compile the declarative spec with vega-lite, run it in a headless
 * vega View (renderer 'none', nothing drawn to a canvas, nothing fetched) and serialise the scene
 * to SVG. The only entry point from the report code to the plotting libraries.
 */
import { parse, View, type LoggerInterface } from 'vega';
import { compile, type TopLevelSpec } from 'vega-lite';
import { installTextMetrics } from './text-metrics.js';
import { plotConfig } from './theme.js';

/** A Vega-Lite specification (the library's own typed spec). */
export type PlotSpec = TopLevelSpec;

/** A rendered picture: SVG text and whatever the libraries warned about while rendering it. */
export interface RenderedSvg {
  readonly svg: string;
  readonly warnings: readonly string[];
}

/** Options of renderSvg. */
export interface RenderOptions {
  /**
   * Prefix for every id inside the SVG (clip paths, gradients), so that several pictures inlined in
   * one HTML page never share an id. Letters, digits, '-' and '_' only. Default: none.
   */
  readonly idPrefix?: string;
}

/** A logger that keeps the libraries' warnings instead of printing them. */
function collectingLogger(warnings: string[]): LoggerInterface {
  let level = 2;
  const keep = (...args: readonly unknown[]): void => {
    warnings.push(args.map((a) => (a instanceof Error ? a.message : String(a))).join(' '));
  };
  const logger = {
    level(l?: number): number | LoggerInterface {
      if (l === undefined) return level;
      level = l;
      return logger as LoggerInterface;
    },
    error(...args: readonly unknown[]) {
      keep(...args);
      return logger as LoggerInterface;
    },
    warn(...args: readonly unknown[]) {
      keep(...args);
      return logger as LoggerInterface;
    },
    info() {
      return logger as LoggerInterface;
    },
    debug() {
      return logger as LoggerInterface;
    },
  };
  return logger as LoggerInterface;
}

/** Give every id in an SVG document a prefix, and follow the references to them. */
export function prefixSvgIds(svg: string, prefix: string): string {
  if (!/^[A-Za-z][A-Za-z0-9_-]*$/.test(prefix)) throw new Error(`report: id prefix ${JSON.stringify(prefix)} must be letters, digits, - or _`);
  return svg
    .replace(/\bid="([^"]+)"/g, (_m, id: string) => `id="${prefix}${id}"`)
    .replace(/url\(#([^)]+)\)/g, (_m, id: string) => `url(#${prefix}${id})`)
    .replace(/href="#([^"]+)"/g, (_m, id: string) => `href="#${prefix}${id}"`);
}

/**
 * Render a Vega-Lite spec to SVG with the house style (theme.ts) applied beneath the spec's own
 * config. Each call uses its own View, finalised afterwards.
 */
export async function renderSvg(spec: PlotSpec, options: RenderOptions = {}): Promise<RenderedSvg> {
  installTextMetrics();
  const warnings: string[] = [];
  const logger = collectingLogger(warnings);
  const withConfig = { ...spec, config: { ...plotConfig(), ...(spec.config ?? {}) } } as PlotSpec;
  const vgSpec = compile(withConfig, { logger }).spec;
  const view = new View(parse(vgSpec), { renderer: 'none', logger });
  try {
    let svg = await view.toSVG();
    if (options.idPrefix !== undefined) svg = prefixSvgIds(svg, options.idPrefix);
    return { svg, warnings };
  } finally {
    view.finalize();
  }
}
