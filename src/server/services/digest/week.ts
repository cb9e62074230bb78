import "server-only";
import type { campaigns } from "@/server/db/schema";

type Campaign = typeof campaigns.$inferSelect;

export const DAY = 86_400_000;

/** The local date-time parts of an instant in a time zone (no library: Intl knows the zones). */
function localParts(now: Date, timeZone: string) {
  const f = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    weekday: "short",
    hourCycle: "h23",
  });
  const p = Object.fromEntries(f.formatToParts(now).map((x) => [x.type, x.value]));
  const weekday = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"].indexOf(p.weekday!) + 1; // ISO: Monday 1
  return { y: Number(p.year), m: Number(p.month), d: Number(p.day), hour: Number(p.hour), weekday };
}

function safeZone(tz: string): string {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone: tz });
    return tz;
  } catch {
    return "UTC";
  }
}

/** Monday (YYYY-MM-DD) of the ISO week that `now` falls in, in the campaign's time zone: the digest's week. */
export function digestWeek(now: Date, timeZone: string): string {
  const l = localParts(now, safeZone(timeZone));
  const monday = new Date(Date.UTC(l.y, l.m - 1, l.d) - (l.weekday - 1) * DAY);
  return monday.toISOString().slice(0, 10);
}

/** Is this week's digest due: on or after the campaign's weekday and hour (local), in the same ISO week. */
export function digestDue(c: Pick<Campaign, "timeZone" | "digestWeekday" | "digestHour">, now: Date): boolean {
  const l = localParts(now, safeZone(c.timeZone));
  return l.weekday > c.digestWeekday || (l.weekday === c.digestWeekday && l.hour >= c.digestHour);
}
