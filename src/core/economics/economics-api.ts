export type {
  PfBasis,
  Tariff,
  KvaDemandTariff,
  PfAdjustedKwTariff,
  KvarhExcessTariff,
  NoReactiveTariff,
  BillingState,
  PeriodCharge,
} from "./tariff.js";
export { DEFAULT_PF_BASIS, periodCharge, tariffWithDefaults } from "./tariff.js";
export type {
  BillingPeriod,
  IntervalMethod,
  PeriodFigures,
  EconomicsInput,
  EconomicsResult,
  InstalledCostInput,
  LossSavingsInput,
  PeriodSavings,
} from "./savings.js";
export { economics } from "./savings.js";
export type { CostItem, CostItemInput } from "./cost-items.js";
