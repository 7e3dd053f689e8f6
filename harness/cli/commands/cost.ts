/** `speedbound cost`: the cost model's assumptions and a worked example. */
import { join } from "node:path";
import { EXIT } from "../../errors.js";
import { resolveCostModel } from "../resolve.js";
import { costModelRows } from "../../predict/cost-table.js";
import { type Args } from "./shared.js";

/** `speedbound cost`: the cost model's assumptions and a worked example. */
export async function cost(argv: Args): Promise<number> {
  const rows = costModelRows(resolveCostModel(argv));
  const w = [0, 0];
  for (const r of rows) {
    w[0] = Math.max(w[0], r.quantity.length);
    w[1] = Math.max(w[1], r.value.length);
  }
  for (const r of rows) process.stdout.write(`${r.quantity.padEnd(w[0])}  ${r.value.padEnd(w[1])}  ${r.source}\n`);
  return EXIT.ok;
}
