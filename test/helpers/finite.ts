/** Paths of every number in `v` that is NaN or ±Infinity (typed arrays included), walked before any serialising. */
export function nonFinitePaths(v: unknown, at = "", out: string[] = []): string[] {
  if (typeof v === "number") {
    if (!Number.isFinite(v)) out.push(at || "(root)");
  } else if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
    Array.prototype.forEach.call(v, (x: number, i: number) => nonFinitePaths(x, `${at}[${i}]`, out));
  } else if (Array.isArray(v)) v.forEach((x, i) => nonFinitePaths(x, `${at}[${i}]`, out));
  else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) nonFinitePaths(x, at ? `${at}.${k}` : k, out);
  return out;
}
