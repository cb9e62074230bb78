"use client";
import useSWR from "swr";
import { fetchJson } from "./fetcher";
import { apiPaths } from "./api-paths";
import type { SearchResult, importView } from "@/server/services/compounds";

/** One row of GET /api/compounds (units: mw g/mol, exactMass Da, tpsa Å²): the server's own type. */
export type CompoundItem = SearchResult["items"][number];

/** GET /api/compounds: a page of the registry. */
export type CompoundPage = SearchResult & { limit: number; offset: number };

export type CompoundSearchParams = {
  q?: string;
  substructure?: string;
  limit: number;
  offset: number;
  sort?: string;
  dir?: "asc" | "desc";
  library?: string;
  mwMin?: string;
  mwMax?: string;
};

export function compoundSearchUrl(p: CompoundSearchParams): string {
  const qs = new URLSearchParams({ limit: String(p.limit), offset: String(p.offset), thumbnails: "1" });
  for (const k of ["q", "substructure", "sort", "dir", "library", "mwMin", "mwMax"] as const) {
    const v = p[k];
    if (v !== undefined && v !== "") qs.set(k, v);
  }
  return `${apiPaths.compounds}?${qs.toString()}`;
}

/** A page of the registry (search, substructure, sort, filters), paged on the server. */
export function useCompoundSearch(p: CompoundSearchParams) {
  return useSWR<CompoundPage>(compoundSearchUrl(p), fetchJson, { keepPreviousData: true, revalidateOnFocus: false });
}

/** GET/POST /api/compound-imports…: an import job as the server writes it. */
export type ImportJobView = ReturnType<typeof importView>;

/** Step 1 of an import: send the file; the server stores it with its checksum and starts preparing it. */
export function startCompoundImport(file: File): Promise<ImportJobView> {
  const body = new FormData();
  body.append("file", file);
  return fetchJson<ImportJobView>(apiPaths.compoundImports, { method: "POST", body });
}

/** Step 3: register the prepared records, all or nothing or the valid ones only. */
export function commitCompoundImport(id: string, mode: "all_or_nothing" | "valid_only"): Promise<ImportJobView> {
  return fetchJson<ImportJobView>(apiPaths.compoundImportCommit(id), {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ mode }),
  });
}

/** An import job, polled every second while it is being prepared (a reload shows the same progress). */
export function useImportJob(id: string) {
  return useSWR<ImportJobView>(apiPaths.compoundImport(id), fetchJson, {
    refreshInterval: (data) =>
      !data || data.status === "stored" || data.status === "preparing" || data.status === "committing" ? 1000 : 0,
  });
}
