/** The summary table's rows that every view of a surface result fills the same way. */
import { DAY_S } from "../src/constants.js";
import { duration, sig } from "../src/report/format.js";
import { cycleWords } from "../src/report/wording.js";
import { $, fmt, setText } from "./dom.js";

/** One row of min, max, mean and swing: the cells `<row>-min`, `-max`, `-mean`, `-swing`. */
export function showStatsRow(row: "t" | "teq" | "night", t: { minK: number; maxK: number; meanK: number; swingK: number }): void {
  setText(`${row}-min`, fmt(t.minK));
  setText(`${row}-max`, fmt(t.maxK));
  setText(`${row}-mean`, fmt(t.meanK));
  setText(`${row}-swing`, fmt(t.swingK));
}

/** The orbital period, the cycle summarised (one orbit, or a resonance's several) and the solar day when there is one. */
export function showCycleRows(s: { periodSeconds: number; cycleSeconds: number; solarDaySeconds?: number | null }): void {
  setText("period", `${fmt(s.periodSeconds / DAY_S, 2)} d`);
  const cycle = cycleWords(s.periodSeconds, s.cycleSeconds);
  setText("cycle", cycle === "of the orbit" ? "one orbit" : `${sig(s.cycleSeconds / s.periodSeconds, 3)} orbits (the spin–orbit resonance repeats)`);
  const solar = s.solarDaySeconds;
  $("solar-day-row").hidden = solar === undefined;
  if (solar !== undefined) setText("solar-day", solar === null ? "none (synchronous spin)" : duration(solar));
}
