/**
 * Version of the numerical engine. Analyses record it for provenance, so a stored result can be
 * traced to the code that produced it. Bump the minor version when a result can change.
 */
export const ENGINE_VERSION = "kinetics-1.1.0";
