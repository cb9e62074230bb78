"use client";
import useSWR from "swr";
import { fetchJson } from "./fetcher";

/** One row of GET /api/compounds (units: mw g/mol, exactMass Da, tpsa Å²). */
export type CompoundItem = {
  id: string;
  registryId: string;
  name: string | null;
  aliases: string[];
  smiles: string;
  formula: string;
  mw: number;
  exactMass: number;
  heavyAtoms: number;
  clogp: number;
  hbd: number;
  hba: number;
  tpsa: number;
  rotatableBonds: number;
  registeredAt: string;
  svg?: string;
  rank?: string;
};

export type CompoundPage = {
  items: CompoundItem[];
  total: number;
  totalIsLowerBound: boolean;
  limit: number;
  offset: number;
  substructure?: { understoodAs: string; candidates: number; checked: number; timedOut: boolean };
};

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
  return `/api/compounds?${qs.toString()}`;
}

/** A page of the registry (search, substructure, sort, filters), paged on the server. */
export function useCompoundSearch(p: CompoundSearchParams) {
  return useSWR<CompoundPage>(compoundSearchUrl(p), fetchJson, { keepPreviousData: true, revalidateOnFocus: false });
}

export type ImportIssue = { record: number; line: number; field: string; message: string };
export type ImportJobView = {
  id: string;
  fileName: string;
  sha256: string;
  sizeBytes: number;
  format: string;
  status: "stored" | "preparing" | "ready" | "failed" | "committing" | "committed";
  progress: { done: number; total: number };
  error: string | null;
  mode: "all_or_nothing" | "valid_only" | null;
  createdAt: string;
  committedAt: string | null;
  preview: null | {
    format: string;
    totalRecords: number;
    valid: number;
    invalid: number;
    invalidRecords: number[];
    issues: ImportIssue[];
    issuesShown: number;
    issuesTotal: number;
    warnings: ImportIssue[];
    warningsTotal: number;
    ignoredFields: string[];
    sample: { record: number; line: number; name: string | null; smiles: string; formula: string; mw: number }[];
    prepareMs: number;
  };
  result: null | {
    mode: string;
    registered: number;
    notRegistered: number;
    firstRegistryId: string | null;
    lastRegistryId: string | null;
  };
};

export const importJobUrl = (id: string) => `/api/compound-imports/${id}`;

/** An import job, polled every second while it is being prepared (a reload shows the same progress). */
export function useImportJob(id: string) {
  return useSWR<ImportJobView>(importJobUrl(id), fetchJson, {
    refreshInterval: (data) =>
      !data || data.status === "stored" || data.status === "preparing" || data.status === "committing" ? 1000 : 0,
  });
}
