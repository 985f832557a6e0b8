export { EstimateInputError } from './input-error.util.js';
export { parseFdi, isFdi, ALL_FDI_CODES, type FdiTooth } from './tooth-fdi.util.js';
export { usualCanals, toothGroup, archPositionLevel, isMaxillaryMolar } from './canals.util.js';
export { ISO_SIZES, isIsoSize, isoColour, diameterAt, type IsoColour } from './instruments.util.js';
export {
  factorCatalogue,
  checkAssessment,
  checkFacts,
  resolveAssessment,
  curvatureLevel,
  apicalOpeningLevel,
  toothLengthLevel,
  asaClassLevel,
  levelRank,
  maxLevel,
  isLevel,
  isFactorKey,
  MAX_CANALS,
  type LevelSource,
  type ResolvedAssessment,
} from './factors.util.js';
export { combine, type Difficulty } from './difficulty.util.js';
export { DEFAULT_ESTIMATE_TABLE } from '@ostium/shared';
export {
  estimate,
  checkTable,
  type EstimateInput,
  type Calibration,
  type CalibrationCell,
  type CalibrationSource,
} from './estimate.util.js';
export {
  learnCalibration,
  calibrationFor,
  calibrationLookup,
  calibrationOptions,
  bookedMinutes,
  accuracyReport,
  predictLeavingOneOut,
  cellKey,
  clippedLogRatio,
  cellOutlierBound,
  quantile,
  type CalibrationOptions,
  type CalibrationModel,
  type CellEffect,
  type OperatorEffect,
} from './calibration.util.js';
