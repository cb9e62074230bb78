import "server-only";
/**
 * Analysis use cases: experiments, their inputs and provenance, requesting (queued for the
 * worker) and running an analysis, reading results, and mechanism overrides.
 */
export { createExperiment, experimentRunList, getExperiment, listExperiments, type Experiment } from "./experiments";
export { currentInputs } from "./inputs";
export { analyseNow, requestAnalysis, type AnalysisRequest } from "./request";
export { runAnalysis, type Progress } from "./run";
export { requeueStaleAnalyses, retryAnalysis, type Requeued } from "./recover";
export { CHENG_PRUSOFF_TOLERANCE } from "./cheng-prusoff";
export { analysisHistory, analysisJson, getAnalysis, type Analysis, type AnalysisJson } from "./history";
export {
  chosenModel,
  compoundResultDetail,
  experimentResults,
  maskedPoints,
  resultJson,
  type ExperimentResult,
  type OverrideRow,
} from "./results";
export { overrideMechanism } from "./overrides";
export { updateExperiment } from "./experiment-update";
export { planFromResult, planMechanismPlate, type PlanRequest } from "./plan";
