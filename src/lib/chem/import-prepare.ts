/**
 * Second stage of a bulk import: parse each record's structure, compute the registry properties
 * and the screening fingerprint, and find duplicates inside the file. Pure and synchronous; the
 * server then checks the structure keys against the database and writes in one transaction.
 *
 * - A structure that does not parse is an issue on the `smiles`/`molfile` field with parse.ts's
 *   sentence.
 * - Salts: when the parent was taken from a multi-component structure and the record has no salt
 *   form, the removed components (SMILES, joined by ".") become the batch's `saltForm`, so the
 *   information is not lost; a warning says so.
 * - Duplicates: a record whose structure key equals an earlier record's is an issue ("same
 *   structure as record 3") by default, or only a warning with `{ duplicates: "warn" }`. Records
 *   that share the stereo-free key but not the structure key (stereo forms) get a warning.
 */
import { fingerprint, toBitString } from "./fingerprint";
import type { ImportIssue, ImportRecord } from "./import-types";
import { parseStructure } from "./parse";
import { type CompoundProperties, computeProperties } from "./properties";

export interface PreparedRecord extends ImportRecord {
  properties: CompoundProperties;
  /** '0'/'1' × 1024 for the `bit(1024)` column (see fingerprint.ts). */
  fingerprintBits: string;
  removedComponents: string[];
}

export interface PrepareResult {
  prepared: PreparedRecord[];
  issues: ImportIssue[];
  warnings: ImportIssue[];
}

export interface PrepareOptions {
  duplicates?: "reject" | "warn";
}

export function prepareImport(records: readonly ImportRecord[], options: PrepareOptions = {}): PrepareResult {
  const prepared: PreparedRecord[] = [];
  const issues: ImportIssue[] = [];
  const warnings: ImportIssue[] = [];
  const byKey = new Map<string, ImportRecord>();
  const byFlatKey = new Map<string, ImportRecord>();
  for (const rec of records) {
    const field = rec.smiles !== undefined ? "smiles" : "molfile";
    const parsed = parseStructure(rec.smiles !== undefined ? { smiles: rec.smiles } : { molfile: rec.molfile ?? "" });
    if (!parsed.ok) {
      issues.push({ record: rec.recordNo, line: rec.line, field, message: parsed.error });
      continue;
    }
    const properties = computeProperties(parsed.molecule);
    const first = byKey.get(properties.structureKey);
    if (first) {
      const issue = {
        record: rec.recordNo,
        line: rec.line,
        field,
        message: `Same structure as record ${first.recordNo} (line ${first.line}).`,
      };
      if (options.duplicates === "warn") warnings.push(issue);
      else {
        issues.push(issue);
        continue;
      }
    } else {
      byKey.set(properties.structureKey, rec);
      const sibling = byFlatKey.get(properties.flatKey);
      if (sibling) {
        warnings.push({
          record: rec.recordNo,
          line: rec.line,
          field,
          message: `Another stereo form of record ${sibling.recordNo} (line ${sibling.line}); both will be registered.`,
        });
      } else byFlatKey.set(properties.flatKey, rec);
    }
    const out: PreparedRecord = {
      ...rec,
      properties,
      fingerprintBits: toBitString(fingerprint(parsed.molecule, false)),
      removedComponents: parsed.removedComponents,
    };
    if (parsed.removedComponents.length > 0) {
      const salt = parsed.removedComponents.join(".");
      if (!rec.batch?.saltForm) {
        out.batch = { ...rec.batch, saltForm: salt.slice(0, 100) };
        warnings.push({
          record: rec.recordNo,
          line: rec.line,
          field,
          message: `Kept the largest component; recorded "${salt}" as the batch's salt form.`,
        });
      } else {
        warnings.push({
          record: rec.recordNo,
          line: rec.line,
          field,
          message: `Kept the largest component; removed ${salt}.`,
        });
      }
    }
    prepared.push(out);
  }
  return { prepared, issues, warnings };
}
