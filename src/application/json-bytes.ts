/**
 * A large JSON answer as UTF-8 bytes, ready for the socket: the same bytes the default serialiser sends
 * (JSON.stringify, UTF-8), as a Buffer so it is written as it is rather than transcoded on the socket's slow path.
 * The engine's texts are kept within Latin-1 (test/core/latin1-texts.test.ts) so that JSON.stringify builds a
 * one-byte string: one character beyond U+00FF anywhere in a result (a "≥" in a note) makes the whole text two-byte
 * and the serialisation and encoding of a 25 KB sizing answer about twice as slow. A user's label beyond Latin-1
 * still serialises correctly, only slower. The one place a result becomes bytes: the sizing route's answer and a
 * survey's stored result (which its 201 answer carries) alike.
 */
export function jsonBytes(value: unknown): Buffer {
  return Buffer.from(JSON.stringify(value), "utf8");
}
