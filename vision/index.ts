// The measurement engine's public surface: framework-free, no DOM and no Node APIs, for the main thread, a Web Worker,
// route handlers and the CLI alike.
export { analyzeCapture, DEFAULT_TRACKING_LIMITS, type AnalyzeOptions, type CaptureAnalysis, type CaptureInput, type TrackingLimits } from "./analyze-capture";
export { handAxes, readMotion, wristAngles, type AngleReading, type HandAxes, type MotionReading } from "./angles";
export {
  CORRECTION_MODEL,
  CORRECTION_VERSION,
  correctMotionAngle,
  correctionGroupFor,
  hasGroupFit,
  type CorrectionModel,
  type HandModel,
  type RawAngleFeatures,
} from "./correction";
export { estimateFingerJointDeg, fingerFeatures, FINGER_FEATURES, inTrainingDomain, type Finger, type FingerJoint } from "./estimator";
export { DIGIT_CHAIN, LANDMARK_COUNT, type HandLandmarks } from "./landmarks";
export { DEFAULT_ONE_EURO, OneEuroFilter, type OneEuroParams } from "./one-euro";
export {
  createLivePipeline,
  DEFAULT_MIN_SCORE,
  type FrameQuality,
  type LivePipeline,
  type LivePipelineOptions,
  type LiveUpdate,
  type MeasurementMethod,
  type PipelineFrame,
  type PipelineSummary,
} from "./pipeline";
export { IMAGE_DOWN, PLANE_LIMITS, planeVerdict, readPlane, type PlaneReading, type PlaneVerdict } from "./plane";
export { DEFAULT_REP_PARAMS, RepSegmenter, type RepParams, type RepPhase, type Repetition } from "./reps";
export {
  angleUncertaintyDeg,
  trackingFactor,
  UNCERTAINTY_TABLE,
  viewFromHand,
  type UncertaintyTable,
  type ValidationCell,
  type ValidationView,
} from "./uncertainty";
export type { Vec3 } from "./vec";
export {
  describeView,
  majorityView,
  measureView,
  viewInstruction,
  viewName,
  viewPolicy,
  viewQuality,
  type CameraPlacement,
  type ViewPolicy,
  type ViewQuality,
} from "./view-policy";
export {
  FOREARM_SOURCES,
  forearmFromNeutral,
  NEUTRAL_LIMITS,
  neutralReading,
  neutralReadingUncertaintyDeg,
  WRIST_AXIS_VALIDATION,
  type ForearmSource,
  type NeutralFrame,
  type NeutralOutcome,
  type NeutralReading,
} from "./wrist-axis";
