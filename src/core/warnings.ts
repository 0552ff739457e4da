/** A finding the electrician should read; `path` points into the request when one field caused it. */
export interface Warning {
  code: string;
  message: string;
  path?: string;
}

/** A plausibility failure that makes a reading unusable: reported as a 400 with its path. */
export interface InputIssue {
  path: (string | number)[];
  message: string;
}

export function warning(code: string, message: string, path?: string): Warning {
  return path === undefined ? { code, message } : { code, message, path };
}
