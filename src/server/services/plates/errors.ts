import "server-only";
import { AppError, type ErrorDetail } from "@/server/errors";
import type { PlateIssue } from "@/lib/plates";

/** Plate-library issues as the API's details: line (text files) or field = cell (XLSX), well, message. */
export function issueDetails(issues: readonly PlateIssue[]): ErrorDetail[] {
  return issues.map((i) => ({
    ...(i.line !== undefined ? { line: i.line } : {}),
    ...(i.cell !== undefined ? { field: i.cell } : {}),
    ...(i.well !== undefined ? { well: i.well } : {}),
    message: i.message,
  }));
}

/** One 400 for a list of issues: the first sentence, how many more, and every issue as a detail. */
export function issuesError(issues: readonly PlateIssue[]): AppError {
  const first = issues[0]!.text;
  const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? "s" : ""})` : "";
  return new AppError("bad_request", `${first}${more}`, { details: issueDetails(issues) });
}
