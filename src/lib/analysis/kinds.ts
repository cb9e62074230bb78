/**
 * The kinds of experiment an analysis can be: one list for the database enum, the zod schemas
 * and the code that branches on a kind.
 */
export const EXPERIMENT_KINDS = ["single-dose", "dose-response", "mechanism"] as const;

export type ExperimentKind = (typeof EXPERIMENT_KINDS)[number];
