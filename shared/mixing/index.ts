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
} from './topup';
export {
  injectionRatio,
  concentratePerVolume,
  dosingRate,
  type InjectionRatioInput,
  type DosingRateInput,
} from './injection';
