// The digest's week and schedule: time zones via the IANA database in Intl; the expected dates
// are read off a calendar (2026-11-30 is a Monday).
import { describe, it, expect } from "vitest";
import { digestDue, digestWeek } from "./week";

describe("digest week and schedule (time zones via the IANA database in Intl)", () => {
  it("uses the Monday of the ISO week in the campaign's zone", () => {
    // 2026-11-30 is a Monday. 23:30 UTC on Sunday 29 Nov is already Monday in Berlin (UTC+1).
    expect(digestWeek(new Date("2026-11-29T23:30:00Z"), "UTC")).toBe("2026-11-23");
    expect(digestWeek(new Date("2026-11-29T23:30:00Z"), "Europe/Berlin")).toBe("2026-11-30");
    expect(digestWeek(new Date("2026-12-03T12:00:00Z"), "America/New_York")).toBe("2026-11-30");
  });
  it("is due from the campaign's weekday and hour (local) until the end of that ISO week", () => {
    const c = { timeZone: "Europe/Berlin", digestWeekday: 1, digestHour: 7 };
    expect(digestDue(c, new Date("2026-11-30T05:59:00Z"))).toBe(false); // 06:59 in Berlin
    expect(digestDue(c, new Date("2026-11-30T06:00:00Z"))).toBe(true); // 07:00 in Berlin
    expect(digestDue(c, new Date("2026-12-02T10:00:00Z"))).toBe(true); // Wednesday
  });
});
