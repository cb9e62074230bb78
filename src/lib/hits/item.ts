import type { TriageStatus } from "./query";

/** One row of GET /api/campaigns/{id}/hits (concentrations µM, LE kcal/mol per heavy atom, MW g/mol). */
export type HitItem = {
  registryId: string;
  name: string | null;
  mechanism: string | null;
  mechanismLabel: string | null;
  ki: number | null;
  kiCi95: [number | null, number | null];
  kic: number | null;
  kiu: number | null;
  alpha: number | null;
  ic50: number | null;
  ic50Qualifier: string | null;
  ic50Ci95: [number | null, number | null];
  hill: number | null;
  pctInhibition: number | null;
  hit: boolean | null;
  pKi: number | null;
  le: number | null;
  lipe: number | null;
  mw: number | null;
  clogp: number | null;
  heavyAtoms: number | null;
  flags: string[];
  flagged: boolean;
  status: TriageStatus;
  owner: string | null;
  statusChangedAt: string | null;
  lastTested: string | null;
  comments: number;
};
