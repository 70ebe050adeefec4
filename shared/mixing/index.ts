export {
  concentrateVolume,
  mixFromRatio,
  describeRatio,
  RATIO_CONVENTIONS,
  type RatioConvention,
  type MixSplit,
  type RatioReadings,
} from './dilution';
export {
  topUpPlan,
  type TopUpInput,
  type TopUpPlan,
  type TopUpPlanOk,
  type TopUpPlanRefused,
  type TopUpRefusal,
  type TopUpRefusalFigures,
} from './topup';
export {
  injectionRatio,
  concentratePerVolume,
  dosingRate,
  type InjectionRatioInput,
  type DosingRateInput,
} from './injection';
export {
  BATCH_FIT_WARN_SHARE,
  INPUT_UNITS_PER_LITRE,
  litresPerInputUnit,
  batchVolumeL,
  batchFit,
  batchOverText,
  inputShortfalls,
  type BatchFitInput,
  type BatchFitFigures,
  type BatchFit,
  type InputShortfall,
} from './batch-fit';
