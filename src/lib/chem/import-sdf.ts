/**
 * SDF import: records separated by a line `$$$$`; each record is a molfile (up to `M  END`)
 * followed by data items, each a header line `> <field>` (anything may surround the angle
 * brackets, e.g. `>  <name>  (1)`) and value lines up to a blank line (CTfile formats, SDF
 * section, as published by the format's owner; from memory). Field names are matched like CSV
 * headers (see import-fields.ts). When no name field is given, the molfile's first line (the
 * title) is used as the name if it is not blank.
 *
 * Written here rather than with openchemlib's SDFileParser because the import needs the line
 * where each record starts and the raw molfile per record, and the grammar is small.
 */
import { type CanonicalField, canonicalField, checkRecord, type RawFields } from "./import-fields";
import { emptyResult, type ImportParseResult, MAX_IMPORT_BYTES, MAX_IMPORT_RECORDS } from "./import-types";

interface SdfRecord {
  line: number;
  molfile: string;
  title: string;
  data: { name: string; value: string }[];
}

const FIELD_HEADER = /^>.*?<([^>]*)>/;

function splitRecords(text: string): SdfRecord[] | string {
  const lines = text.split(/\r\n|\r|\n/);
  const records: SdfRecord[] = [];
  let start = 0;
  const flush = (end: number) => {
    const block = lines.slice(start, end);
    if (block.every((l) => l.trim() === "")) return;
    const mEnd = block.findIndex((l) => /^M {2}END\s*$/.test(l));
    const firstField = block.findIndex((l) => FIELD_HEADER.test(l));
    const ctabEnd = mEnd >= 0 ? mEnd + 1 : firstField >= 0 ? firstField : block.length;
    const data: { name: string; value: string }[] = [];
    for (let i = ctabEnd; i < block.length; i++) {
      const m = FIELD_HEADER.exec(block[i] ?? "");
      if (!m) continue;
      const value: string[] = [];
      let j = i + 1;
      while (j < block.length && (block[j] ?? "").trim() !== "") value.push(block[j++] ?? "");
      data.push({ name: (m[1] ?? "").trim(), value: value.join("\n").trim() });
      i = j;
    }
    records.push({
      line: start + 1,
      molfile: block.slice(0, ctabEnd).join("\n"),
      title: (block[0] ?? "").trim(),
      data,
    });
  };
  for (let i = 0; i < lines.length; i++) {
    if ((lines[i] ?? "").trimEnd() === "$$$$") {
      flush(i);
      start = i + 1;
      if (records.length > MAX_IMPORT_RECORDS) return `more than ${MAX_IMPORT_RECORDS.toLocaleString("en")} records`;
    }
  }
  flush(lines.length);
  if (records.length > MAX_IMPORT_RECORDS) return `more than ${MAX_IMPORT_RECORDS.toLocaleString("en")} records`;
  return records;
}

export function parseSdfImport(input: string | Uint8Array): ImportParseResult {
  const size = typeof input === "string" ? input.length : input.byteLength;
  if (size > MAX_IMPORT_BYTES)
    return emptyResult("sdf", [`The file is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB.`]);
  const text = typeof input === "string" ? input : new TextDecoder("utf-8").decode(input);
  const split = splitRecords(text.replace(/^\uFEFF/, ""));
  if (typeof split === "string") {
    return emptyResult("sdf", [
      `The file has ${split}; the limit is ${MAX_IMPORT_RECORDS.toLocaleString("en")}. Split it into several files.`,
    ]);
  }
  if (split.length === 0) return emptyResult("sdf", ["The file contains no SDF records."]);

  const result: ImportParseResult = { ...emptyResult("sdf", []), totalRecords: split.length };
  const ignored = new Set<string>();
  split.forEach((rec, i) => {
    const raw: RawFields = { molfile: rec.molfile };
    const labels: Partial<Record<CanonicalField, string>> = { molfile: "molfile" };
    for (const { name, value } of rec.data) {
      const field = canonicalField(name);
      if (!field || field === "molfile" || field === "smiles") {
        if (field !== "molfile" && field !== "smiles") ignored.add(name);
        continue;
      }
      raw[field] = value;
      labels[field] = name;
    }
    if (raw.name === undefined && rec.title !== "") raw.name = rec.title;
    const { record, issues } = checkRecord(i + 1, rec.line, raw, labels);
    if (record) result.records.push(record);
    else {
      result.issues.push(...issues);
      result.rejected.push({ recordNo: i + 1, line: rec.line, fields: raw as Record<string, string> });
    }
  });
  result.ignoredFields = [...ignored];
  return result;
}
