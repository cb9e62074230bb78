/**
 * Potency and efficiency figures of the hit grid, from the published definitions.
 *
 * - pKi = −log10(Ki in mol/L) = 6 − log10(Ki in µM).
 * - Ligand efficiency LE = 1.37 · pKi / heavy atoms, in kcal/mol per heavy atom at 298 K
 *   (2.303·R·T = 1.364 ≈ 1.37 kcal/mol; Hopkins, Groom & Alex, Drug Discov Today 2004;9:430).
 * - Lipophilic efficiency LipE (also LLE) = pKi − cLogP (Leeson & Springthorpe, Nat Rev Drug
 *   Discov 2007;6:881).
 *
 * The hit table computes the same expressions in SQL (src/server/services/hits.ts) so that
 * every row can be sorted and filtered in Postgres; the integration test checks the two agree.
 */

/** pKi from Ki in µM: Ki 0.01 µM (10 nM) → 8. Null for a missing or non-positive Ki. */
export function pKiFromMicromolar(kiUm: number | null | undefined): number | null {
  if (kiUm === null || kiUm === undefined || !Number.isFinite(kiUm) || kiUm <= 0) return null;
  return 6 - Math.log10(kiUm);
}

/** LE = 1.37 · pKi / heavy atoms (kcal/mol per heavy atom, 298 K). pKi 8, 25 heavy atoms → 0.4384. */
export function ligandEfficiency(pKi: number | null, heavyAtoms: number | null | undefined): number | null {
  if (pKi === null || heavyAtoms === null || heavyAtoms === undefined || !(heavyAtoms > 0)) return null;
  return (1.37 * pKi) / heavyAtoms;
}

/** LipE = pKi − cLogP. pKi 8, cLogP 3 → 5. */
export function lipophilicEfficiency(pKi: number | null, clogp: number | null | undefined): number | null {
  if (pKi === null || clogp === null || clogp === undefined || !Number.isFinite(clogp)) return null;
  return pKi - clogp;
}
