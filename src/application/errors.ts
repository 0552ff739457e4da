import type { InputIssue } from "../core/warnings.js";

/** The engine found readings implausible (e.g. kW above kVA): the caller's input is at fault, each issue names its field. */
export class InputRejected extends Error {
  constructor(readonly issues: InputIssue[]) {
    super(issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; "));
    this.name = "InputRejected";
  }
}

/** The thing named does not exist in the caller's organisation (HTTP: 404). */
export class NotFound extends Error {
  constructor(readonly what: string) {
    super(`${what} was not found`);
    this.name = "NotFound";
  }
}

/** One field of the request names something unusable (HTTP: 400 naming the field). */
export class FieldRejected extends Error {
  constructor(
    readonly path: string,
    message: string,
  ) {
    super(message);
    this.name = "FieldRejected";
  }
}

/** The write cannot be done as asked in the present state (HTTP: 409). */
export class Conflict extends Error {
  constructor(
    readonly reason: "last_admin_key" | "changed_meanwhile",
    message: string,
    readonly path?: string,
  ) {
    super(message);
    this.name = "Conflict";
  }
}
