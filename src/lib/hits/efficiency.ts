/**
 * Potency and efficiency figures of the hit grid, from the published definitions.
 *
 * - pKi = −log10(Ki in mol/L) = 6 − log10(Ki in µM).
 * - Ligand efficiency LE = 1.37 · pKi / heavy atoms, in kcal/mol per heavy atom at 298 K
 *   (2.303·R·T = 1.364 ≈ 1.37 kcal/mol; Hopkins, Groom & Alex, Drug Discov Today 2004;9:430).
 * - Lipophilic efficiency LipE (also LLE) = pKi − cLogP (Leeson & Springthorpe, Nat Rev Drug
 *   Discov 2007;6:881).
 *
 * This module is the one owner of the definitions. The hit rows are sorted and filtered in
 * Postgres, so the refresh SQL takes its expressions from `efficiencySql` below, built from the
 * same constants; an integration test compares the stored figures with these functions.
 */

/** −log10 of 1 µM in mol/L: pKi = PKI_OFFSET_UM − log10(Ki in µM). */
export const PKI_OFFSET_UM = 6;

/** 2.303·R·T at 298 K in kcal/mol, rounded as Hopkins, Groom & Alex (2004) use it. */
export const LE_KCAL_PER_MOL_PER_LOG_UNIT = 1.37;

/** pKi from Ki in µM: Ki 0.01 µM (10 nM) → 8. Null for a missing or non-positive Ki. */
export function pKiFromMicromolar(kiUm: number | null | undefined): number | null {
  if (kiUm === null || kiUm === undefined || !Number.isFinite(kiUm) || kiUm <= 0) return null;
  return PKI_OFFSET_UM - Math.log10(kiUm);
}

/** LE = 1.37 · pKi / heavy atoms (kcal/mol per heavy atom, 298 K). pKi 8, 25 heavy atoms → 0.4384. */
export function ligandEfficiency(pKi: number | null, heavyAtoms: number | null | undefined): number | null {
  if (pKi === null || heavyAtoms === null || heavyAtoms === undefined || !(heavyAtoms > 0)) return null;
  return (LE_KCAL_PER_MOL_PER_LOG_UNIT * pKi) / heavyAtoms;
}

/** LipE = pKi − cLogP. pKi 8, cLogP 3 → 5. */
export function lipophilicEfficiency(pKi: number | null, clogp: number | null | undefined): number | null {
  if (pKi === null || clogp === null || clogp === undefined || !Number.isFinite(clogp)) return null;
  return pKi - clogp;
}

/**
 * The three definitions above as Postgres expression text over the given column expressions
 * (trusted identifiers from the caller's own SQL, never user input). Null propagates as in the
 * functions: no positive Ki gives no pKi; no heavy atoms gives no LE. `log` on double precision
 * is the base-10 logarithm in Postgres.
 */
export function efficiencySql(cols: { kiUm: string; pKi: string; heavyAtoms: string; clogp: string }): {
  pKi: string;
  le: string;
  lipe: string;
} {
  return {
    pKi: `case when ${cols.kiUm} > 0 then ${PKI_OFFSET_UM} - log(${cols.kiUm}) end`,
    le: `case when ${cols.heavyAtoms} > 0 then ${LE_KCAL_PER_MOL_PER_LOG_UNIT} * ${cols.pKi} / ${cols.heavyAtoms} end`,
    lipe: `${cols.pKi} - ${cols.clogp}`,
  };
}
