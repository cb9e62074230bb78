import "server-only";
import { AppError } from "@/server/errors";
import type { SessionUser } from "./session";
import { requireCapabilityAnywhere } from "./guard";

/**
 * For pages only: whether to show the write controls of the compound registry. The actions and
 * routes check again on the server (requireCapabilityAnywhere); this only hides buttons.
 */
export async function canWriteCompounds(_user: SessionUser): Promise<boolean> {
  try {
    await requireCapabilityAnywhere("compound:write");
    return true;
  } catch (e) {
    if (e instanceof AppError && (e.code === "forbidden" || e.code === "unauthorized")) return false;
    throw e;
  }
}
