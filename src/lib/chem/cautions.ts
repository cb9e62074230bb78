/**
 * Caution texts for the compound screens (wording ours; content is common practice and follows
 * the product's design notes). The register form and the bulk import show the first; compound
 * pages and exports that carry computed properties show the second.
 */
export const CHEMICAL_HANDLING_CAUTION =
  "Handle compounds and solvents (including DMSO stock solutions) according to their safety data sheets and your institution's chemical-hygiene rules.";

export const COMPUTED_PROPERTIES_CAUTION =
  "Computed properties (cLogP, TPSA, donor/acceptor counts) are estimates for research use only; decisions need review by a qualified scientist.";
