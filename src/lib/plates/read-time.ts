/**
 * Read times written above the blocks of a kinetic plate-grid export.
 *
 * Accepted (case-insensitive), on the nearest line above a block's header row that reads as a
 * time, or in the block's top-left corner cell:
 * - a label with the word "time", then the value: `Time (s): 30`, `Time [s],30`, `time_s=30`,
 *   `Time: 30 s`, `Time,0:00:30`, `Read 4 time: 1.5 min`;
 * - a bare value alone on the line: `30`, `30 s`, `30 sec`, `0.5 min`, `00:00:30`, `0:30`.
 * Units: ms, s/sec/secs/seconds (the default), min/mins/minutes, h; `h:mm:ss` and `m:ss` clock
 * forms. A unit after the number overrides one in the label.
 */

const UNIT_SECONDS: Record<string, number> = {
  ms: 0.001,
  s: 1,
  sec: 1,
  secs: 1,
  second: 1,
  seconds: 1,
  min: 60,
  mins: 60,
  minute: 60,
  minutes: 60,
  h: 3600,
  hr: 3600,
  hours: 3600,
};

const CLOCK_HMS = /^(\d+):(\d{1,2}):(\d{1,2}(?:\.\d+)?)$/;
const CLOCK_MS = /^(\d+):(\d{1,2}(?:\.\d+)?)$/;
const VALUE_UNIT = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?)\s*(ms|s|secs?|seconds?|mins?|minutes?|h|hr|hours)?$/;
const LABEL =
  /\btime(?:[\s_]*[([]?\s*(ms|s|secs?|seconds?|mins?|minutes?|h|hr|hours)\s*[)\]]?)?(?:\s*[:=]\s*|\s+|$)(.*)$/;

function round(x: number): number {
  return Math.round(x * 1e9) / 1e9;
}

/** A bare duration in seconds (`30`, `30 s`, `0.5 min`, `0:00:30`), or undefined. */
export function parseDuration(text: string, defaultUnitSeconds = 1): number | undefined {
  const s = text.trim().toLowerCase();
  let m = CLOCK_HMS.exec(s);
  if (m) return round(Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3]));
  m = CLOCK_MS.exec(s);
  if (m) return round(Number(m[1]) * 60 + Number(m[2]));
  m = VALUE_UNIT.exec(s);
  if (m) {
    const unit = m[2] ? UNIT_SECONDS[m[2]] : defaultUnitSeconds;
    if (unit === undefined) return undefined;
    return round(Number(m[1]) * unit);
  }
  return undefined;
}

export type TimeLabel =
  | { readonly kind: "time"; readonly seconds: number }
  | { readonly kind: "bad"; readonly text: string }
  | { readonly kind: "none" };

/**
 * Interpret one line (its non-blank cells) as a read time. `bare` allows a value with no label.
 * A line that names "time" but holds no readable value is `bad`, so the user hears about it.
 */
export function parseTimeLabel(cells: readonly string[], bare: boolean): TimeLabel {
  const parts = cells.map((c) => c.trim()).filter((c) => c !== "");
  if (parts.length === 0) return { kind: "none" };
  const text = parts.join(" ");
  const lower = text.toLowerCase();
  if (bare && parts.length === 1) {
    const d = parseDuration(lower);
    if (d !== undefined) return { kind: "time", seconds: d };
  }
  const m = LABEL.exec(lower.replace(/time_s\b/, "time (s)").replace(/time_(ms|sec|min)\b/, "time ($1)"));
  if (!m) return { kind: "none" };
  const labelUnit = m[1] ? UNIT_SECONDS[m[1]] : 1;
  const rest = (m[2] ?? "").trim();
  const d = parseDuration(rest, labelUnit ?? 1);
  if (d !== undefined) return { kind: "time", seconds: d };
  return { kind: "bad", text };
}
