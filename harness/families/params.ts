/** Helpers shared by the instance families. */
import type { FamilyParams } from "./types.js";

/**
 * A canonical string for family parameters (keys sorted), so that the same resolved parameters always
 * hash to the same instance seeds whatever order the options were given in.
 */
export function canonicalParams(params: FamilyParams): string {
  return Object.keys(params)
    .sort()
    .map((k) => `${k}=${String(params[k])}`)
    .join(",");
}
