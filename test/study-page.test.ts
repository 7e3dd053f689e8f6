// report.html, the study page (issue 13): self-contained, opened in Debian's headless Chromium, which must load
// it without console messages and find every figure's marks. .ci/run installs chromium and sets
// SB_REQUIRE_CHROMIUM=1; elsewhere the browser part skips with a message when /usr/bin/chromium is missing.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli } from "./helpers/cli.js";
import { LINKED_FILES } from "../harness/report/html.js";

const CHROMIUM = "/usr/bin/chromium";
const HAVE_CHROMIUM = existsSync(CHROMIUM);
if (!HAVE_CHROMIUM && process.env.SB_REQUIRE_CHROMIUM === "1") throw new Error("SB_REQUIRE_CHROMIUM=1 but /usr/bin/chromium is missing");
if (!HAVE_CHROMIUM) console.warn("study-page.test: /usr/bin/chromium not installed (apt-get install -y chromium); browser checks skipped");

let root = "";
let out = "";
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-page-"));
  out = join(root, "study");
  const r = cli(["run", "--family", "ksat", "--n", "8:14:2", "--instances", "4", "--seed", "page", "--solvers", "exhaustive,walk,anneal", "--sweeps", "10,100", "--trials", "40", "--resamples", "200", "--workers", "2", "--predict", "grover,amplified-walk", "--out", out]);
  if (r.code !== 0) throw new Error(`run failed: ${r.stderr}`);
}, 120_000);
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** Headless Chromium with the flags that keep it off the network; returns stdout and the console lines of stderr. */
function chromium(args: string[], url: string): { stdout: string; console: string[]; code: number | null } {
  const profile = mkdtempSync(join(root, "profile-"));
  const r = spawnSync(
    CHROMIUM,
    [
      "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
      "--disable-component-update", "--disable-sync", `--user-data-dir=${profile}`, "--enable-logging=stderr", "--v=0",
      ...args, url,
    ],
    { encoding: "utf8", timeout: 90_000 },
  );
  // Chromium logs every page console message (and failed resource loads) to stderr as "...:CONSOLE:LINE] ...".
  const consoleLines = (r.stderr ?? "").split("\n").filter((l) => /:CONSOLE[:(]/.test(l));
  return { stdout: r.stdout ?? "", console: consoleLines, code: r.status };
}

describe("study page", () => {
  it("is self-contained: figures inline, no script, nothing fetched, links to files that exist", () => {
    const html = readFileSync(join(out, "report.html"), "utf8");
    expect(html.startsWith("<!DOCTYPE html>")).toBe(true);
    expect(html).not.toMatch(/<script/i);
    // Only XML namespace names may mention http(s); nothing is loaded from a URL (no src=, no remote href).
    expect(html.replace(/xmlns(:\w+)?="http:\/\/www\.w3\.org\/[^"]*"/g, "")).not.toMatch(/https?:\/\//);
    expect(html).not.toMatch(/\ssrc=/);
    for (const name of ["work", "time", "instances"]) expect(html).toContain(`data-figure="${name}"`);
    for (const f of LINKED_FILES) {
      expect(html).toContain(`href="${f}"`);
      expect(existsSync(join(out, f)), f).toBe(true);
    }
    // The rules and the caveats are on the page.
    expect(html).toContain("Fixed-cost floor");
    expect(html).toContain("Exponential or polynomial");
  });

  it.skipIf(!HAVE_CHROMIUM)("the console check catches a page that logs an error (negative control)", () => {
    const bad = join(root, "bad.html");
    writeFileSync(bad, '<!DOCTYPE html><html><body><script>console.error("speedbound-negative-control")</script></body></html>');
    const r = chromium(["--dump-dom"], `file://${bad}`);
    expect(r.console.some((l) => l.includes("speedbound-negative-control"))).toBe(true);
  }, 120_000);

  it.skipIf(!HAVE_CHROMIUM)("loads in Chromium without console messages and every figure has its marks", () => {
    const r = chromium(["--dump-dom"], `file://${join(out, "report.html")}`);
    expect(r.code).toBe(0);
    expect(r.console).toEqual([]);
    // The DOM as the browser built it: each figure holds an <svg> with point marks (vega's aria role "point").
    const figures = [...r.stdout.matchAll(/<figure id="figure-(\w+)"[^]*?<\/figure>/g)];
    expect(figures.map((m) => m[1])).toEqual(["work", "time", "instances"]);
    for (const m of figures) {
      expect(m[0]).toContain("<svg");
      expect((m[0].match(/aria-roledescription="point"/g) ?? []).length, `marks of ${m[1]}`).toBeGreaterThan(0);
    }
    // Work and time figures carry fitted lines (vega line marks).
    for (const m of figures.slice(0, 2)) expect(m[0]).toContain("mark-line role-mark");
    // A screenshot to look at (kept beside the page in the test's temporary folder while it runs).
    const shot = chromium(["--window-size=1300,2600", `--screenshot=${join(out, "report.png")}`], `file://${join(out, "report.html")}`);
    expect(shot.console).toEqual([]);
    expect(existsSync(join(out, "report.png"))).toBe(true);
    if (process.env.SB_KEEP_SCREENSHOT) writeFileSync(process.env.SB_KEEP_SCREENSHOT, readFileSync(join(out, "report.png")));
  }, 180_000);
});
