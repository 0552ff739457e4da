/** Bank design: placement of correction, fixed/switched steps, protection, discharge, and designBank combining them. */
export * from "./placement-rules.js";
export * from "./placement.js";
export * from "./demand.js";
export * from "./simulate.js";
export * from "./steps.js";
export * from "./protection.js";
export * from "./discharge.js";
export * from "./design.js";
