/** The commands of the tool, one file each (cli.ts dispatches to them). */
export { run } from "./run.js";
export { demo } from "./demo.js";
export { solve } from "./solve.js";
export { instance } from "./instance.js";
export { report } from "./report.js";
export { spectral } from "./spectral.js";
export { cost } from "./cost.js";
export { merge } from "./merge.js";
export { compare } from "./compare.js";
export { slurm } from "./slurm.js";
