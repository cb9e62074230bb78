// A corpus of hostile uploads, generated (no binaries committed): zip bombs that tell the truth or
// lie about their sizes, damaged zips and workbooks, sheets over the row and column caps, huge
// shared strings, formulas, deep and entity-laden XML, text with NULs, BOMs, odd encodings and
// line endings, a 24 MB header line, 1e308 / NaN / Infinity readings, binary noise, broken and
// huge SDF records and path-like names. All content is INVENTED; nothing here is a reference.
// The file kinds are those the upload endpoints take (src/server/services/plates/upload.ts,
// src/server/services/compounds/imports/start.ts); each is hostile to at least one endpoint.
import zlib from "node:zlib";
import crypto from "node:crypto";

export type HostileFile = { name: string; bytes: Uint8Array; what: string };

type ZipEntry = {
  name: string;
  data?: Uint8Array;
  /** compressed stream given directly (for bombs built in chunks) */
  deflated?: Uint8Array;
  rawSize?: number;
  crc?: number;
  method?: number;
  /** sizes written in the headers, when they should lie */
  declaredSize?: number;
  declaredCrc?: number;
};

const enc = (s: string) => new TextEncoder().encode(s);

/** A zip archive (PKWARE APPNOTE 4.3): local headers, data, central directory, end record. */
export function zip(entries: ZipEntry[], opts: { omitCentral?: boolean; truncateAt?: number } = {}): Uint8Array {
  const chunks: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  for (const e of entries) {
    const name = Buffer.from(e.name, "latin1");
    const method = e.method ?? 8;
    const raw = e.data ?? new Uint8Array(0);
    const body = e.deflated ?? (method === 8 ? zlib.deflateRawSync(raw, { level: 9 }) : Buffer.from(raw));
    const size = e.declaredSize ?? e.rawSize ?? raw.byteLength;
    const crc = e.declaredCrc ?? e.crc ?? zlib.crc32(raw);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(method, 8);
    local.writeUInt32LE(crc >>> 0, 14);
    local.writeUInt32LE(body.byteLength, 18);
    local.writeUInt32LE(size >>> 0, 22);
    local.writeUInt16LE(name.byteLength, 26);
    chunks.push(local, name, Buffer.from(body.buffer, body.byteOffset, body.byteLength));
    const c = Buffer.alloc(46);
    c.writeUInt32LE(0x02014b50, 0);
    c.writeUInt16LE(20, 4);
    c.writeUInt16LE(20, 6);
    c.writeUInt16LE(method, 10);
    c.writeUInt32LE(crc >>> 0, 16);
    c.writeUInt32LE(body.byteLength, 20);
    c.writeUInt32LE(size >>> 0, 24);
    c.writeUInt16LE(name.byteLength, 28);
    c.writeUInt32LE(offset, 42);
    central.push(c, name);
    offset += 30 + name.byteLength + body.byteLength;
  }
  const cd = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(entries.length, 8);
  end.writeUInt16LE(entries.length, 10);
  end.writeUInt32LE(cd.byteLength, 12);
  end.writeUInt32LE(offset, 16);
  const all = Buffer.concat(opts.omitCentral ? chunks : [...chunks, cd, end]);
  return new Uint8Array(opts.truncateAt ? all.subarray(0, opts.truncateAt) : all);
}

/** `bytes` copies of one byte deflated as one stream fed block by block, never held whole: a bomb's payload. */
async function deflatedRepeat(bytes: number, fill = 0x20): Promise<{ deflated: Uint8Array; crc: number }> {
  const block = Buffer.alloc(1024 * 1024, fill);
  const deflate = zlib.createDeflateRaw({ level: 9 });
  const parts: Buffer[] = [];
  deflate.on("data", (b: Buffer) => parts.push(b));
  const ended = new Promise<void>((resolve, reject) => {
    deflate.on("end", resolve);
    deflate.on("error", reject);
  });
  let crc = 0;
  for (let done = 0; done < bytes; done += block.byteLength) {
    const piece = bytes - done >= block.byteLength ? block : block.subarray(0, bytes - done);
    crc = zlib.crc32(piece, crc);
    if (!deflate.write(piece)) await new Promise((r) => deflate.once("drain", r));
  }
  deflate.end();
  await ended;
  return { deflated: new Uint8Array(Buffer.concat(parts)), crc };
}

const CT = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/><Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/></Types>`;
const RELS = `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>`;
const WB = `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets><sheet name="Plate" sheetId="1" r:id="rId1"/></sheets></workbook>`;
const WB_RELS = `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="sharedStrings.xml"/></Relationships>`;
const SHEET_HEAD = `<?xml version="1.0" encoding="UTF-8"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>`;
const SHEET_TAIL = `</sheetData></worksheet>`;
const EMPTY_SST = `<?xml version="1.0" encoding="UTF-8"?><sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" count="0" uniqueCount="0"></sst>`;

function workbook(sheetXml: string | Uint8Array, extra: ZipEntry[] = [], sst = EMPTY_SST): ZipEntry[] {
  return [
    { name: "[Content_Types].xml", data: enc(CT) },
    { name: "_rels/.rels", data: enc(RELS) },
    { name: "xl/workbook.xml", data: enc(WB) },
    { name: "xl/_rels/workbook.xml.rels", data: enc(WB_RELS) },
    { name: "xl/worksheets/sheet1.xml", data: typeof sheetXml === "string" ? enc(sheetXml) : sheetXml },
    { name: "xl/sharedStrings.xml", data: enc(sst) },
    ...extra,
  ];
}

/** A 96-well long table as inline-string and number cells; `value(r, c)` gives each cell's XML. */
function plateSheet(value: (well: string, i: number) => string): string {
  const rows = [
    `<row r="1"><c r="A1" t="inlineStr"><is><t>well</t></is></c><c r="B1" t="inlineStr"><is><t>value</t></is></c></row>`,
  ];
  let i = 0;
  for (const r of "ABCDEFGH")
    for (let c = 1; c <= 12; c++, i++) {
      const n = i + 2;
      rows.push(`<row r="${n}"><c r="A${n}" t="inlineStr"><is><t>${r}${c}</t></is></c>${value(`B${n}`, i)}</row>`);
    }
  return SHEET_HEAD + rows.join("") + SHEET_TAIL;
}
const num = (ref: string, v: string) => `<c r="${ref}"><v>${v}</v></c>`;

function csvPlate(value: (i: number) => string, opts: { eol?: (i: number) => string; header?: string } = {}): string {
  const eol = opts.eol ?? (() => "\n");
  const lines = [opts.header ?? "well,value"];
  let i = 0;
  for (const r of "ABCDEFGH") for (let c = 1; c <= 12; c++, i++) lines.push(`${r}${c},${value(i)}`);
  return lines.map((l, k) => l + eol(k)).join("");
}

function utf16(text: string, bom: "le" | "be" | "none"): Uint8Array {
  const le = Buffer.from(text, "utf16le");
  if (bom === "be") {
    const be = Buffer.alloc(le.length);
    for (let i = 0; i < le.length; i += 2) {
      be[i] = le[i + 1]!;
      be[i + 1] = le[i]!;
    }
    return new Uint8Array(Buffer.concat([Buffer.from([0xfe, 0xff]), be]));
  }
  return new Uint8Array(bom === "le" ? Buffer.concat([Buffer.from([0xff, 0xfe]), le]) : le);
}

const MOL_END = "M  END";
function molfile(atoms: number, opts: { end?: boolean; countsLie?: number } = {}): string {
  const lines = ["invented", "  hostile-corpus", ""];
  const bonds = Math.max(0, atoms - 1);
  const n = String(opts.countsLie ?? atoms)
    .padStart(3)
    .slice(-3);
  lines.push(`${n}${String(bonds).padStart(3).slice(-3)}  0  0  0  0  0  0  0  0999 V2000`);
  for (let i = 0; i < atoms; i++)
    lines.push(`${(i * 1.5).toFixed(4).padStart(10)}    0.0000    0.0000 C   0  0  0  0  0  0  0  0  0  0  0  0`);
  for (let i = 1; i < atoms; i++) lines.push(`${String(i).padStart(3)}${String(i + 1).padStart(3)}  1  0`);
  if (opts.end !== false) lines.push(MOL_END);
  return lines.join("\n");
}

let cached: HostileFile[] | undefined;

/** The corpus (built once per process): at least 80 files. */
export async function hostileCorpus(): Promise<HostileFile[]> {
  if (cached) return cached;
  const out: HostileFile[] = [];
  const add = (name: string, bytes: Uint8Array | string, what: string) =>
    out.push({ name, bytes: typeof bytes === "string" ? enc(bytes) : bytes, what });
  const MB = 1024 * 1024;

  // Zip bombs.
  const pad280 = await deflatedRepeat(280 * MB);
  add(
    "bomb-280mb-declared.xlsx",
    zip(
      workbook(
        plateSheet((r) => num(r, "1")),
        [{ name: "xl/media/pad.bin", deflated: pad280.deflated, crc: pad280.crc, rawSize: 280 * MB }],
      ),
    ),
    "1 MB workbook inflating to 280 MB, sizes declared truly",
  );
  add(
    "bomb-280mb-underdeclared.xlsx",
    zip(
      workbook(
        plateSheet((r) => num(r, "1")),
        [{ name: "xl/media/pad.bin", deflated: pad280.deflated, crc: pad280.crc, declaredSize: 1000 }],
      ),
    ),
    "the same bomb declaring 1,000 bytes",
  );
  const pad1g = await deflatedRepeat(1024 * MB);
  add(
    "bomb-1gb-underdeclared.xlsx",
    zip(
      workbook(
        plateSheet((r) => num(r, "1")),
        [{ name: "xl/media/pad.bin", deflated: pad1g.deflated, crc: pad1g.crc, declaredSize: 10 }],
      ),
    ),
    "1 GB of padding declared as 10 bytes",
  );
  const sheetBomb = await deflatedRepeat(200 * MB, 0x20);
  add(
    "bomb-sheet-whitespace.xlsx",
    zip([
      ...workbook("").filter((e) => !e.name.includes("sheet1")),
      { name: "xl/worksheets/sheet1.xml", deflated: sheetBomb.deflated, crc: sheetBomb.crc, declaredSize: 100 },
    ]),
    "a worksheet of 200 MB of spaces, under-declared",
  );
  add(
    "bomb-zip64-declared.xlsx",
    zip(
      workbook(
        plateSheet((r) => num(r, "1")),
        [{ name: "xl/media/big.bin", data: enc("x"), declaredSize: 0xffffffff }],
      ),
    ),
    "an entry declaring the zip64 marker size",
  );

  // Sheets over the caps, shared strings, formulas, XML tricks.
  add(
    "rows-800k.xlsx",
    zip(workbook(SHEET_HEAD + Array.from({ length: 800_000 }, (_, i) => `<row r="${i + 1}"/>`).join("") + SHEET_TAIL)),
    "800,000 empty rows (over the row cap)",
  );
  add(
    "columns-1e6.xlsx",
    zip(workbook(SHEET_HEAD + "<row>" + "<c><v>1</v></c>".repeat(1_000_000) + "</row>" + SHEET_TAIL)),
    "one row of 1,000,000 cells without references",
  );
  add(
    "columns-xfd.xlsx",
    zip(workbook(SHEET_HEAD + `<row r="1"><c r="A1"><v>1</v></c><c r="XFD1"><v>2</v></c></row>` + SHEET_TAIL)),
    "a cell in column XFD (16,384)",
  );
  const bigString = "S".repeat(40 * MB);
  add(
    "shared-string-40mb.xlsx",
    zip(
      workbook(
        SHEET_HEAD + `<row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1"><v>1</v></c></row>` + SHEET_TAIL,
        [],
        `<?xml version="1.0"?><sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" count="1" uniqueCount="1"><si><t>${bigString}</t></si></sst>`,
      ),
    ),
    "one 40 MB shared string used as a header",
  );
  add(
    "shared-strings-many.xlsx",
    zip(
      workbook(
        SHEET_HEAD + SHEET_TAIL,
        [],
        `<?xml version="1.0"?><sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">${"<si><t>xxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxx</t></si>".repeat(2_200_000)}</sst>`,
      ),
    ),
    "2.2 million shared strings (over 100 MB inflated)",
  );
  add(
    "formulas.xlsx",
    zip(workbook(plateSheet((r) => `<c r="${r}"><f>1+1</f><v>2</v></c>`))),
    "every reading a formula",
  );
  add(
    "formula-injection-strings.xlsx",
    zip(workbook(plateSheet((r) => `<c r="${r}" t="inlineStr"><is><t>=cmd|' /C calc'!A0</t></is></c>`))),
    "readings that are spreadsheet commands",
  );
  add(
    "deep-xml.xlsx",
    zip(
      workbook(
        SHEET_HEAD +
          `<row r="1"><c r="A1" t="inlineStr"><is><t>` +
          "<b>".repeat(100_000) +
          "x" +
          "</b>".repeat(100_000) +
          `</t></is></c></row>` +
          SHEET_TAIL,
      ),
    ),
    "100,000 nested elements in one cell",
  );
  add(
    "entity-expansion.xlsx",
    zip(
      workbook(
        `<?xml version="1.0"?><!DOCTYPE lolz [<!ENTITY lol "lol"><!ENTITY lol2 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;"><!ENTITY lol3 "&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;"><!ENTITY lol4 "&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;">]><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>&lol4;</t></is></c></row></sheetData></worksheet>`,
      ),
    ),
    "nested entity expansion in a worksheet",
  );
  add(
    "external-entity.xlsx",
    zip(
      workbook(
        `<?xml version="1.0"?><!DOCTYPE x [<!ENTITY xxe SYSTEM "file:///etc/passwd">]><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>&xxe;</t></is></c></row></sheetData></worksheet>`,
      ),
    ),
    "an external entity naming a local file",
  );
  add(
    "values-1e308.xlsx",
    zip(workbook(plateSheet((r, i) => num(r, i === 30 ? "1e308" : "100")))),
    "one reading of 1e308",
  );
  add(
    "values-nan-text.xlsx",
    zip(
      workbook(plateSheet((r, i) => (i === 5 ? `<c r="${r}" t="inlineStr"><is><t>NaN</t></is></c>` : num(r, "100")))),
    ),
    "one reading NaN as text",
  );
  add(
    "values-error-cells.xlsx",
    zip(workbook(plateSheet((r) => `<c r="${r}" t="e"><v>#DIV/0!</v></c>`))),
    "error cells",
  );
  add(
    "bad-xml.xlsx",
    zip(workbook(SHEET_HEAD + "<row><c><v>1</v></row>")),
    "worksheet XML that does not close its tags",
  );
  add("not-xml-sheet.xlsx", zip(workbook(crypto.randomBytes(4096))), "a worksheet of random bytes");

  // Damaged zips.
  const good = zip(workbook(plateSheet((r) => num(r, "100"))));
  add("truncated-half.xlsx", good.subarray(0, Math.floor(good.length / 2)), "a workbook cut in half");
  add("truncated-end.xlsx", good.subarray(0, good.length - 10), "a workbook missing its last 10 bytes");
  add(
    "no-central-directory.xlsx",
    zip(workbook(plateSheet((r) => num(r, "100"))), { omitCentral: true }),
    "local headers only",
  );
  add(
    "bad-crc.xlsx",
    zip(workbook(plateSheet((r) => num(r, "100"))).map((e) => ({ ...e, declaredCrc: 12345 }))),
    "every CRC wrong",
  );
  add(
    "corrupt-deflate.xlsx",
    zip(
      workbook("").map((e) =>
        e.name.includes("sheet1") ? { ...e, deflated: crypto.randomBytes(2048), rawSize: 50_000 } : e,
      ),
    ),
    "a worksheet whose compressed data is noise",
  );
  add(
    "unsupported-method.xlsx",
    zip(
      workbook(plateSheet((r) => num(r, "100"))).map((e) => ({
        ...e,
        method: 12,
        deflated: zlib.deflateRawSync(e.data!),
      })),
    ),
    "entries claiming bzip2",
  );
  add("empty-zip.xlsx", zip([]), "an empty zip archive");
  add("zip-not-a-workbook.xlsx", zip([{ name: "readme.txt", data: enc("hello") }]), "a zip with a text file");
  add(
    "zip-many-entries.xlsx",
    zip(Array.from({ length: 3000 }, (_, i) => ({ name: `f${i}.txt`, data: enc("x") }))),
    "3,000 entries",
  );
  add(
    "zip-traversal-names.xlsx",
    zip(
      workbook(
        plateSheet((r) => num(r, "100")),
        [
          { name: "../../../../etc/evil.sh", data: enc("echo no") },
          { name: "/abs/path.xml", data: enc("<x/>") },
        ],
      ),
    ),
    "entries named with ../ and absolute paths",
  );
  add("zip-named.csv", good, "a workbook named .csv");
  add(
    "legacy.xls",
    new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, ...crypto.randomBytes(4000)]),
    "an OLE compound file (legacy .xls)",
  );
  add(
    "legacy-named.xlsx",
    new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, ...crypto.randomBytes(4000)]),
    "a legacy .xls named .xlsx",
  );
  add("noise.xlsx", crypto.randomBytes(64 * 1024), "random bytes named .xlsx");
  add("zip-header-only.xlsx", new Uint8Array([0x50, 0x4b, 0x03, 0x04]), "a zip signature and nothing else");

  // Text: empty, encodings, line endings, NULs.
  add("empty.csv", new Uint8Array(0), "an empty file");
  add("only-bom.csv", new Uint8Array([0xef, 0xbb, 0xbf]), "a UTF-8 byte-order mark only");
  add("whitespace.csv", " \n\t\r\n   \n", "whitespace only");
  add(
    "bom-plate.csv",
    new Uint8Array([0xef, 0xbb, 0xbf, ...enc(csvPlate(() => "100"))]),
    "a plate with a UTF-8 BOM (every well 100)",
  );
  add(
    "utf16le-bom.csv",
    utf16(
      csvPlate(() => "100"),
      "le",
    ),
    "UTF-16LE with BOM",
  );
  add(
    "utf16be-bom.csv",
    utf16(
      csvPlate(() => "100"),
      "be",
    ),
    "UTF-16BE with BOM",
  );
  add(
    "utf16le-no-bom.csv",
    utf16(
      csvPlate(() => "100"),
      "none",
    ),
    "UTF-16LE without BOM",
  );
  add("utf16-nul-text.csv", utf16("smiles,name\nCCO,a\u0000b\n", "le"), "UTF-16 text with a NUL inside a value");
  add(
    "latin1.csv",
    new Uint8Array([...enc("well,value\nA1,"), 0xe9, 0xe8, ...enc("\nA2,1\n")]),
    "Latin-1 bytes that are not UTF-8",
  );
  add(
    "nul-bytes.csv",
    new Uint8Array([...enc("well,value\nA1,1"), 0, 0, 0, ...enc("\n")]),
    "NUL bytes early in the file",
  );
  add("nul-late.csv", enc(csvPlate(() => "100") + "x".repeat(9000) + "\u0000,1\n"), "a NUL after the first 8 KB");
  add(
    "smiles-nul-late.csv",
    enc("smiles,name\n" + "CCO,ethanol\n".repeat(800) + "CCC,pro\u0000pane\n"),
    "a compound list with a NUL in a name after 8 KB",
  );
  add(
    "mixed-eol.csv",
    csvPlate(() => "100", { eol: (k) => ["\n", "\r\n", "\r"][k % 3]! }),
    "LF, CRLF and CR line endings mixed",
  );
  add(
    "cr-only.csv",
    csvPlate(() => "100", { eol: () => "\r" }),
    "old Mac line endings",
  );
  add("control-chars.csv", "well,value\nA1,\u0001\u0002\u0003\nA2,\u001b[31m1\n", "control characters in cells");
  add("header-24mb.csv", "w".repeat(24 * MB) + "\nA1,1\n", "a 24 MB header line");
  add(
    "smiles-header-24mb.csv",
    "name," + "h".repeat(24 * MB) + "\nx,y\n",
    "a 24 MB header line without a structure column",
  );
  add("line-24mb-no-newline.csv", "a".repeat(24 * MB), "24 MB without a line break");
  add("unclosed-quote.csv", 'well,value\nA1,"100\nA2,100\n' + "x,y\n".repeat(1000), "a quote never closed");
  add("quotes-everywhere.csv", '"""""""""","""""\n'.repeat(5000), "rows of escaped quotes");
  add("many-columns.csv", "well,value" + ",".repeat(1_000_000) + "\nA1,1\n", "a header of 1,000,000 columns");
  add("many-rows.csv", "well,value\n" + "A1,1\n".repeat(2_000_000), "2,000,000 rows of one well");
  add(
    "too-many-reads.csv",
    "well,time_s,value\n" + Array.from({ length: 600 }, (_, t) => `A1,${t},${t}`).join("\n"),
    "600 reads of one well",
  );
  add("semicolon-tab-mix.csv", "well;value\tx\nA1;1\t2\nA2\t1;3\n", "delimiters mixed");

  // Numbers that overflow or are not numbers.
  add(
    "value-1e308.csv",
    csvPlate((i) => (i === 30 ? "1e308" : "100")),
    "one reading of 1e308",
  );
  add(
    "value-minus-1e308.csv",
    csvPlate((i) => (i % 2 ? "-1e308" : "1e308")),
    "±1e308 alternating",
  );
  add(
    "value-1e999.csv",
    csvPlate((i) => (i === 7 ? "1e999" : "100")),
    "1e999 (Infinity as a double)",
  );
  add(
    "value-nan.csv",
    csvPlate((i) => (i === 3 ? "NaN" : "100")),
    "NaN",
  );
  add(
    "value-infinity.csv",
    csvPlate((i) => (i === 3 ? "Infinity" : "100")),
    "Infinity",
  );
  add(
    "value-minus-infinity.csv",
    csvPlate((i) => (i === 3 ? "-Infinity" : "100")),
    "-Infinity",
  );
  add(
    "value-hex.csv",
    csvPlate(() => "0x1F"),
    "hexadecimal readings",
  );
  add(
    "value-huge-digits.csv",
    csvPlate(() => "1" + "0".repeat(400)),
    "400-digit readings",
  );
  add(
    "value-tiny.csv",
    csvPlate(() => "1e-320"),
    "subnormal readings",
  );
  add(
    "value-formula.csv",
    csvPlate(() => '=HYPERLINK("http://invalid")'),
    "readings that are formulas",
  );
  add(
    "time-1e308.csv",
    "well,time_s,value\n" + ["A1", "A2"].flatMap((w) => [`${w},0,1`, `${w},1e308,2`]).join("\n"),
    "read times of 1e308 s",
  );
  add(
    "well-names-hostile.csv",
    "well,value\nZZ9999,1\nA0,1\n-1,1\n<script>,1\n../A1,1\n",
    "well names out of any plate",
  );
  add("html.csv", "<html><script>alert(1)</script></html>\n", "HTML with a script");

  // Binary noise and other formats in disguise.
  add("noise.csv", crypto.randomBytes(256 * 1024), "random bytes named .csv");
  add("noise.sdf", crypto.randomBytes(64 * 1024), "random bytes named .sdf");
  add(
    "png-named.csv",
    new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, ...crypto.randomBytes(2000)]),
    "a PNG header named .csv",
  );
  add("gzip-named.csv", zlib.gzipSync(Buffer.from(csvPlate(() => "100"))), "a gzip file named .csv");
  add("pdf-named.tsv", enc("%PDF-1.4\n%\u00e2\u00e3\n1 0 obj\n<<>>\nendobj\n"), "a PDF header named .tsv");

  // SDF.
  add("sdf-missing-m-end.sdf", molfile(3, { end: false }) + "\n$$$$\n", "a molfile without M  END");
  add("sdf-no-terminator.sdf", molfile(3), "a record without $$$$");
  add("sdf-counts-lie.sdf", molfile(3, { countsLie: 999 }) + "\n$$$$\n", "a counts line claiming 999 atoms for 3");
  add("sdf-huge-molfile.sdf", molfile(999) + "\n$$$$\n", "a 999-atom chain");
  add("sdf-huge-field.sdf", molfile(3) + "\n> <name>\n" + "n".repeat(20 * MB) + "\n\n$$$$\n", "a 20 MB data field");
  add("sdf-many-empty.sdf", "\n$$$$\n".repeat(20_000), "20,000 empty records");
  add("sdf-nul.sdf", molfile(3) + "\n> <name>\nbad\u0000name\n\n$$$$\n", "a NUL in a data field");
  add(
    "sdf-v3000-broken.sdf",
    "x\n  y\n\n  0  0  0     0  0            999 V3000\nM  V30 BEGIN CTAB\nM  V30 COUNTS 99999 0 0 0 0\nM  END\n$$$$\n",
    "a broken V3000 block",
  );
  add("sdf-named.csv", molfile(3) + "\n$$$$\n", "an SDF named .csv");

  // Compound tables.
  add("smiles-24mb-value.csv", "smiles,name\n" + "C".repeat(20 * MB) + ",long\n", "a 20 MB SMILES");
  add(
    "smiles-10001-records.csv",
    "smiles,name\n" + Array.from({ length: 10_001 }, (_, i) => `C${"C".repeat(i % 7)},r${i}`).join("\n"),
    "10,001 records (over the record cap)",
  );
  add("smiles-1e308-fields.csv", "smiles,name,purity (%),amount (mg)\nCCO,e,1e308,-1e308\n", "1e308 in numeric fields");
  add("smiles-dup-columns.csv", "smiles,SMILES,name\nCCO,CCO,x\n", "two structure columns");
  add(
    "smiles-20mb-and-bad-rows.csv",
    "smiles,name,purity_pct,amount,batch_date,stock_volume_ul\n" +
      "C".repeat(20 * MB) +
      ",huge,,,,\n" +
      Array.from({ length: 9_999 }, (_, i) => `,bad-${i},abc,-5,2024-13-45,-1`).join("\n"),
    "a 20 MB SMILES and 9,999 records with several problems each (stored problems capped)",
  );

  // Plate-map CSVs just under that endpoint's 2 MB cap, so they are parsed, not refused for size.
  add("map-header-1900kb.csv", "w".repeat(1900 * 1024) + "\nA1,sample\n", "a 1.9 MB header line");
  add(
    "map-90000-rows.csv",
    "well,role,compound\n" + "A1,sample,INH-000001\n".repeat(90_000),
    "90,000 rows of one well",
  );
  add("map-quotes-1900kb.csv", '"' + '""'.repeat(950 * 1024) + '"\n', "one 1.9 MB quoted cell of escaped quotes");

  // Path-like, long and odd names on ordinary content.
  const plain = csvPlate(() => "100");
  add("../../etc/passwd.csv", plain, "a path-like name");
  add("C:\\Users\\someone\\plate.csv", plain, "a Windows path as the name");
  add("a".repeat(1000) + ".csv", plain, "a 1,000-character name");
  add("plate\r\nX-Injected: 1.csv", plain, "a name with CR LF");
  add("plate\u202Evsc.exe", plain, "a name with a right-to-left override");
  add("no-extension", plain, "a name without an extension");
  add(".csv", plain, "a name that is only an extension");
  add("<img src=x onerror=alert(1)>.csv", plain, "markup in the name");
  cached = out;
  return out;
}
