import { z } from "zod";

/**
 * Paging of list queries (`limit`, `offset`), with the messages the API has always given.
 * `limit` 1–200, default 50; `offset` from 0 up to `maxOffset`, default 0.
 */
export const pageLimit = z.coerce
  .number()
  .int("limit must be a whole number")
  .min(1, "limit must be 1–200")
  .max(200, "limit must be 1–200")
  .default(50);

export function pageOffset(maxOffset: number, tooLarge?: string) {
  return z.coerce
    .number()
    .int("offset must be a whole number")
    .min(0, "offset must be 0 or more")
    .max(maxOffset, tooLarge)
    .default(0);
}
