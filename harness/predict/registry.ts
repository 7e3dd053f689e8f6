/**
 * The predictor registry: every quantum predictor by name. Adding a predictor is one file exporting a
 * {@link Predictor} and one line in the list below.
 */
import { amplifiedPredictor } from "./amplify.js";
import { groverPredictor, groverUnknownPredictor } from "./grover.js";
import { minFindingPredictor } from "./min-finding.js";
import { spectralPredictor } from "./spectral-cell.js";
import type { Predictor } from "./types.js";

/** Every registered predictor, in the order `--help` lists them. */
export const PREDICTORS: ReadonlyArray<Predictor> = [
  groverPredictor,
  groverUnknownPredictor,
  minFindingPredictor,
  amplifiedPredictor("walk", "amplitude amplification of one Schöning walk trial (BHMT)"),
  amplifiedPredictor("anneal", "amplitude amplification of one annealing trial (BHMT)"),
  spectralPredictor,
];

/** Names of every registered predictor. */
export const PREDICTOR_NAMES: ReadonlyArray<string> = PREDICTORS.map((p) => p.name);

/** The predictor of that name; throws (an internal error: names are validated at the edge). */
export function predictorNamed(name: string): Predictor {
  const p = PREDICTORS.find((x) => x.name === name);
  if (!p) throw new Error(`no predictor named '${name}'`);
  return p;
}
