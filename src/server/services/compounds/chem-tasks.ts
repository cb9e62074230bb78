import "server-only";
import type { ImportRecord } from "@/lib/chem/import-types";
import type { SvgOptions } from "@/lib/chem/svg";
import type { SearchPageOptions } from "@/lib/chem/substructure";

/** What the chemistry worker (src/server/workers/compound-prepare.worker.ts) is asked to do. */
export type ChemTask =
  | { kind: "prepare"; input: { smiles: string } | { molfile: string } }
  | { kind: "svg"; items: { key: string; options: SvgOptions }[] }
  | { kind: "query"; text: string }
  | { kind: "search"; text: string; candidates: { id: string; structureKey: string }[]; options: SearchPageOptions }
  | { kind: "import"; records: ImportRecord[] };
