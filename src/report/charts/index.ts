/** The report's own chart module: geometry builders and the SVG writer (the PDF writer draws the same geometry). */
export * from "./geometry.js";
export { chartToSvg } from "./svg.js";
export { powerTriangleChart, triangleScale, type TriangleChartInput, type TriangleData } from "./triangle.js";
export { impedanceScanChart, type ScanChartInput, type ScanLine } from "./scan.js";
export { durationCurveChart, type DurationChartInput, type StepLevel } from "./duration.js";
export { capacitanceChart, type CapacitanceChartInput, type CapacitanceLine } from "./capacitance.js";
