import type { InputIssue } from "../core/warnings.js";

/** The engine found readings implausible (e.g. kW above kVA): the caller's input is at fault, each issue names its field. */
export class InputRejected extends Error {
  constructor(readonly issues: InputIssue[]) {
    super(issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; "));
    this.name = "InputRejected";
  }
}
