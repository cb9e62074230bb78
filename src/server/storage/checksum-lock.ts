import "server-only";
import { sql } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { deleteObject, headObjectSha256, putObject } from "./s3";

/**
 * Raw files are stored under their SHA-256, so two uploads of the same bytes (in two campaigns,
 * or as a plate run and a compound import) share one object. The object may only be deleted by
 * a failing upload when no committed row uses it, and a good upload must find it in place when
 * it commits. Both steps run under a transaction-scoped advisory lock on the checksum, so they
 * cannot interleave: either the failing upload deletes first and the good one puts the object
 * back before committing, or the good one commits first and the failing one sees its row.
 * The lock is held only for these short steps, never while a file is parsed.
 */
const LOCK_NAMESPACE = 0x52415746; // "RAWF": keeps these locks apart from the other advisory locks

async function lockChecksum(tx: Tx, sha256: string): Promise<void> {
  await tx.execute(sql`select pg_advisory_xact_lock(${LOCK_NAMESPACE}::int, hashtext(${sha256}))`);
}

/**
 * Runs `write` in one transaction that holds the checksum's lock, after making sure the object
 * is in the store with these bytes (putting it again if a failing upload removed it meanwhile).
 */
export async function commitWithObject<T>(
  object: { key: string; bytes: Uint8Array; contentType: string; sha256: string },
  write: (tx: Tx) => Promise<T>,
): Promise<T> {
  return db.transaction(async (tx) => {
    await lockChecksum(tx, object.sha256);
    if ((await headObjectSha256(object.key)) !== object.sha256)
      await putObject(object.key, object.bytes, object.contentType, object.sha256);
    return write(tx);
  });
}

/** Deletes the object unless a committed row still uses it (`isReferenced`), under the checksum's lock. */
export async function deleteUnlessReferenced(
  key: string,
  sha256: string,
  isReferenced: (tx: Tx) => Promise<boolean>,
): Promise<void> {
  try {
    await db.transaction(async (tx) => {
      await lockChecksum(tx, sha256);
      if (await isReferenced(tx)) return;
      await deleteObject(key);
    });
  } catch (e) {
    // A leftover object costs storage only; the refusal the user sees must not change.
    console.error("[inhibitrack] could not remove an unreferenced upload", key, e);
  }
}
