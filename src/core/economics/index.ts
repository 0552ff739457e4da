export type { Tariff, KvaDemandTariff, PfAdjustedKwTariff, KvarhExcessTariff, NoReactiveTariff, BillingState, PeriodCharge } from "./tariff.js";
export { periodCharge } from "./tariff.js";
export type { BillingPeriod, EconomicsInput, EconomicsResult, InstalledCostInput, LossSavingsInput, PeriodSavings } from "./savings.js";
export { economics } from "./savings.js";
