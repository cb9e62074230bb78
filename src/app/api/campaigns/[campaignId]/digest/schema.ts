import { z } from "zod";

export const postBody = z.object({ preview: z.boolean().optional() }).strict();

/** An IANA time zone the runtime knows (Europe/Berlin, America/New_York, UTC). */
export const knownTimeZone = z
  .string()
  .trim()
  .min(1, "Give a time zone.")
  .max(64, "A time zone name has at most 64 characters.")
  .refine((tz) => {
    try {
      new Intl.DateTimeFormat("en-GB", { timeZone: tz });
      return true;
    } catch {
      return false;
    }
  }, "Not a known time zone (e.g. Europe/Berlin, America/New_York, UTC).");

/**
 * Body of PATCH /api/campaigns/{campaignId}/digest: when the weekly digest goes out, in the
 * campaign's time zone. `digestWeekday` is the ISO weekday (1 Monday … 7 Sunday), `digestHour`
 * the local hour 0–23. Fields left out keep their value.
 */
export const PatchDigestBody = z
  .strictObject({
    digestWeekday: z
      .number({ error: "digestWeekday must be a number 1–7." })
      .int("digestWeekday must be a whole number 1–7.")
      .min(1, "digestWeekday is 1 (Monday) to 7 (Sunday).")
      .max(7, "digestWeekday is 1 (Monday) to 7 (Sunday).")
      .optional(),
    digestHour: z
      .number({ error: "digestHour must be a number 0–23." })
      .int("digestHour must be a whole number 0–23.")
      .min(0, "digestHour is 0–23.")
      .max(23, "digestHour is 0–23.")
      .optional(),
    timeZone: knownTimeZone.optional(),
  })
  .refine((b) => Object.values(b).some((v) => v !== undefined), {
    message: "Give at least one of digestWeekday, digestHour, timeZone.",
  });

/** The schedule as PATCH answers it. */
export const DigestScheduleResponse = z.object({
  digestWeekday: z.number().int(),
  digestHour: z.number().int(),
  timeZone: z.string(),
});
