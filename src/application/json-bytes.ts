/**
 * A large JSON answer as UTF-8 bytes, ready for the socket: the same bytes the default serialiser sends
 * (JSON.stringify, UTF-8). Why: one non-ASCII character (a "≥" in a note) makes JSON.stringify's whole text a
 * two-byte string, and handing that string to the socket transcodes it on a slow path; Buffer.from transcodes it
 * on a fast one, and a Buffer is written as it is. Measured on the 25 KB sizing answer. The one place a result
 * becomes bytes: the sizing route's answer and a survey's stored result (which its 201 answer carries) alike.
 */
export function jsonBytes(value: unknown): Buffer {
  return Buffer.from(JSON.stringify(value), "utf8");
}
