/**
 * One colour, point shape and dash pattern per method, the same in every family's figures (issue 13: figures
 * that match across a paper). Legible in grey: each method differs in shape and dash as well as in colour.
 * Colours: the Okabe–Ito palette without its yellow (too faint on white), then dark extras.
 */

/** The drawing style of one method. */
export interface MethodStyle {
  readonly colour: string;
  /** vega symbol name or SVG path in the unit square. */
  readonly shape: string;
  /** Stroke dash (pixels on, off, …); [1, 0] is solid. */
  readonly dash: ReadonlyArray<number>;
}

// A filled ×: filled point marks draw no stroke, so a shape made of lines only would vanish.
const SALTIRE = "M-0.569,-1.057L0.000,-0.488L0.569,-1.057L1.057,-0.569L0.488,0.000L1.057,0.569L0.569,1.057L0.000,0.488L-0.569,1.057L-1.057,0.569L-0.488,0.000L-1.057,-0.569Z";
const HEXAGON = "M0,-1L0.866,-0.5L0.866,0.5L0,1L-0.866,0.5L-0.866,-0.5Z";
const STAR = "M0,-1L0.29,-0.4L0.95,-0.31L0.47,0.15L0.59,0.81L0,0.5L-0.59,0.81L-0.47,0.15L-0.95,-0.31L-0.29,-0.4Z";

/** Fixed styles of the methods the tool knows (solvers first, then predictors). */
export const METHOD_STYLES: Readonly<Record<string, MethodStyle>> = {
  exhaustive: { colour: "#000000", shape: "square", dash: [1, 0] },
  walk: { colour: "#0072B2", shape: "circle", dash: [8, 4] },
  anneal: { colour: "#D55E00", shape: "triangle-up", dash: [2, 3] },
  breakwalk: { colour: "#009E73", shape: "diamond", dash: [10, 3, 2, 3] },
  tempering: { colour: "#CC79A7", shape: "triangle-down", dash: [14, 4] },
  external: { colour: "#882255", shape: "cross", dash: [4, 2] },
  grover: { colour: "#6A3D9A", shape: "circle", dash: [1, 0] },
  "grover-unknown": { colour: "#56B4E9", shape: "square", dash: [6, 6] },
  "min-finding": { colour: "#E69F00", shape: SALTIRE, dash: [10, 3, 2, 3, 2, 3] },
  "amplified-walk": { colour: "#0072B2", shape: STAR, dash: [2, 6] },
  "amplified-anneal": { colour: "#D55E00", shape: "triangle-right", dash: [16, 3, 4, 3] },
  "amplified-breakwalk": { colour: "#009E73", shape: "triangle-left", dash: [3, 3] },
  "amplified-tempering": { colour: "#CC79A7", shape: HEXAGON, dash: [12, 2] },
  spectral: { colour: "#444444", shape: "diamond", dash: [6, 2, 1, 2] },
  adiabatic: { colour: "#999999", shape: "triangle-up", dash: [1, 4] },
};

const EXTRA_COLOURS = ["#117733", "#332288", "#AA4499", "#44AA99", "#88CCEE", "#661100"];
const EXTRA_SHAPES = ["circle", "square", "triangle-up", "diamond", "cross", "triangle-down"];
const EXTRA_DASHES: number[][] = [[5, 2], [9, 2, 2, 2], [3, 5], [12, 4, 3, 4], [7, 7], [2, 2]];

/** The style of a method: its fixed one, or for an unknown name one picked by a hash of the name (stable). */
export function styleOf(method: string): MethodStyle {
  const known = METHOD_STYLES[method];
  if (known !== undefined) return known;
  let h = 0;
  for (let i = 0; i < method.length; i++) h = (h * 31 + method.charCodeAt(i)) >>> 0;
  return {
    colour: EXTRA_COLOURS[h % EXTRA_COLOURS.length]!,
    shape: EXTRA_SHAPES[(h >>> 3) % EXTRA_SHAPES.length]!,
    dash: EXTRA_DASHES[(h >>> 6) % EXTRA_DASHES.length]!,
  };
}
