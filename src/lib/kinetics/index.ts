/**
 * Inhibitrack kinetics engine: pure TypeScript, no I/O, safe in the browser and on the server.
 * Results are for research use and need review by a qualified scientist.
 */
export { ENGINE_VERSION } from "./version";
export {
  regularizedIncompleteBeta,
  inverseRegularizedIncompleteBeta,
  studentTCdf,
  studentTQuantile,
  tCritical95,
  fCdf,
  fSurvival,
} from "./distributions";
export {
  levenbergMarquardt,
  parameterCovariance,
  type LeastSquaresProblem,
  type LeastSquaresOptions,
  type LeastSquaresResult,
} from "./least-squares";
export {
  summarizeControls,
  plateQuality,
  zFactor,
  zPrimeFromMoments,
  signalWindowFromMoments,
  MAD_TO_SD,
  type ControlSummary,
  type PlateQuality,
} from "./plate-statistics";
export { percentInhibition, percentActivity } from "./normalization";
export { callHits, type HitRule, type HitCall } from "./hit-calling";
export { initialRate, type InitialRate, type InitialRateOptions, type ProgressShape } from "./initial-rate";
export {
  fitLogistic4,
  logistic4,
  logistic4Fitted,
  logistic4Problem,
  logistic4Start,
  logistic4Theta,
  type Logistic4Fit,
  type Logistic4Flag,
  type Logistic4Options,
} from "./logistic4";
export {
  fitMichaelisMenten,
  michaelisMenten,
  type MichaelisMentenFit,
  type MichaelisMentenOptions,
} from "./michaelis-menten";
export {
  INHIBITION_MODELS,
  MODEL_PARAMETER_COUNT,
  inhibitedRate,
  mixedRateReciprocal,
  apparentVmax,
  apparentKm,
  apparentKi,
  substrateInhibitedRate,
  partialInhibitedRate,
  tightBindingRate,
  morrisonFraction,
  type InhibitionModel,
  type InhibitionConstants,
} from "./inhibition-models";
export {
  fitMechanism,
  mechanismDataProblem,
  OUTLIER_SCREEN_MARGIN,
  type MechanismPoint,
  type MechanismOptions,
  type MechanismModelFit,
  type MechanismResult,
  type MechanismWeightingChoice,
  type MechanismOutliers,
} from "./mechanism-fit";
export {
  EXTENDED_FAMILIES,
  EXTENDED_MODELS,
  extendedRate,
  extendedConstants,
  extendedParameterCount,
  familyModels,
  modelFamily,
  modelMechanism,
  type ExtendedFamily,
  type ExtendedModel,
  type ExtendedModelFit,
  type Estimate,
  type MechanismAdequacy,
} from "./mechanism-models";
export {
  MECHANISM_LABELS,
  MECHANISM_FLAG_CODES,
  CANDIDATE_MODELS,
  SCREEN_ALPHA,
  TIGHT_BINDING_RATIO,
  NESTED_F_ALPHA,
  CLEAR_F_ALPHA,
  type MechanismLabel,
  type MechanismFlag,
  type MechanismFlagCode,
  type CandidateModel,
  type MechanismRecommendation,
  type MechanismScreens,
} from "./mechanism-judgement";
export { aicc, akaikeWeights, extraSumOfSquaresFTest, type FTestResult } from "./model-selection";
export { finiteOrNull, waldInterval95, reciprocalConstant, type Interval } from "./parameter-summary";
export { ic50FromKi, kiFromIc50, type ChengPrusoffInput, type KiFromIc50Input } from "./cheng-prusoff";
export {
  morrisonFractionalActivity,
  morrisonIc50,
  fitMorrison,
  type MorrisonFit,
  type MorrisonOptions,
} from "./morrison";
export {
  doubleReciprocalPoints,
  doubleReciprocalLines,
  type ReciprocalPoint,
  type ReciprocalLine,
} from "./double-reciprocal";
export {
  parseCsv,
  readMechanismCsv,
  readDoseResponseCsv,
  TableInputError,
  MIN_DOSE_RESPONSE_POINTS,
  MIN_DOSE_RESPONSE_CONCENTRATIONS,
  type DoseResponseSeries,
} from "./table-input";
export {
  chooseWeighting,
  replicateGroups,
  concentrationKeys,
  scaleRows,
  relativeWeightFactors,
  fitRelativeWeighted,
  WEIGHTING_ALPHA,
  WEIGHTING_MIN_SLOPE,
  RELATIVE_WEIGHT_FLOOR,
  type Weighting,
  type ReplicateGroup,
  type WeightingChoice,
  type RelativeFit,
  type RelativeFitOptions,
} from "./weighting";
export {
  robustFit,
  findOutliers,
  rsdr,
  madScale,
  robustWeight,
  benjaminiHochberg,
  DEFAULT_TUNING,
  DEFAULT_OUTLIER_Q,
  type RobustLoss,
  type RobustScaleKind,
  type RobustOptions,
  type RobustFit,
  type OutlierOptions,
  type OutlierResult,
} from "./robust";
export {
  analyseCurve,
  STEP_HILL,
  INACTIVE_BELOW_PCT,
  ACTIVATION_MIN_PCT,
  PARTIAL_BELOW_PCT,
  OUTLIER_SCREEN_T,
  type AnalyseCurveOptions,
  type CurveAnalysis,
  type CurveJudgement,
  type CurveOutcome,
  type CurveOutlier,
  type CurveFlag,
  type ResponseScale,
} from "./dose-response";
