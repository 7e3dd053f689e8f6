/**
 * Renders a vega-lite specification to an SVG document on the server: compiled to vega and drawn by vega's
 * `View.toSVG()` with the "none" renderer (no canvas, no browser, no network). Warnings go to a callback, never
 * to the console (the report is pure).
 */
import { compile, type TopLevelSpec } from "vega-lite";
import { parse, View } from "vega";

/** Renders `spec` to SVG text. */
export async function renderSvg(spec: unknown, onWarning: (message: string) => void = () => undefined): Promise<string> {
  const logger = collectingLogger(onWarning);
  const view = new View(parse(compile(spec as TopLevelSpec, { logger }).spec), { renderer: "none", logger });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

type Logger = NonNullable<NonNullable<Parameters<typeof compile>[1]>["logger"]>;

function collectingLogger(onWarning: (message: string) => void): Logger {
  let level = 2; // vega's Warn
  const logger: Logger = {
    level(value?: number) {
      if (value === undefined) return level;
      level = value;
      return logger;
    },
    error(...args: unknown[]) {
      onWarning(args.map(String).join(" "));
      return logger;
    },
    warn(...args: unknown[]) {
      onWarning(args.map(String).join(" "));
      return logger;
    },
    info() {
      return logger;
    },
    debug() {
      return logger;
    },
  } as Logger;
  return logger;
}
