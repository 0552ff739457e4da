/**
 * Independent oracle for discharge times: the node-voltage equations of a disconnected capacitor bank with its
 * discharge resistors, integrated with classical RK4. Written for the tests, shares nothing with the engine.
 * Nodes with no capacitor (a resistor star point) take the conductance-weighted mean of their neighbours (KCL).
 */
export interface Element {
  a: number;
  b: number;
  /** Farads for a capacitor, ohms for a resistor. */
  value: number;
}

function solve(m: number[][], rhs: number[]): number[] {
  const n = rhs.length;
  const a = m.map((row, i) => [...row, rhs[i] as number]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[p]![c]!)) p = r;
    [a[c], a[p]] = [a[p]!, a[c]!];
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r]![c]! / a[c]![c]!;
      for (let k = c; k <= n; k++) a[r]![k]! -= f * a[c]![k]!;
    }
  }
  return a.map((row, i) => row[n]! / row[i]!);
}

/** Time until every capacitor's voltage magnitude is at or below `thresholdV`; node 0 is the reference. */
export function timeToResidual(
  nodeCount: number,
  caps: Element[],
  resistors: Element[],
  v0: number[],
  thresholdV: number,
  dtS: number,
  maxS: number,
): number {
  const capNodes = [...new Set(caps.flatMap((c) => [c.a, c.b]))].filter((n) => n !== 0).sort((x, y) => x - y);
  const resOnly = Array.from({ length: nodeCount }, (_, i) => i).filter((n) => n !== 0 && !capNodes.includes(n));
  const idx = new Map(capNodes.map((n, i) => [n, i]));
  const cm = capNodes.map(() => capNodes.map(() => 0));
  for (const c of caps) {
    for (const [x, y] of [
      [c.a, c.b],
      [c.b, c.a],
    ] as const) {
      const i = idx.get(x);
      if (i === undefined) continue;
      cm[i]![i]! += c.value;
      const j = idx.get(y);
      if (j !== undefined) cm[i]![j]! -= c.value;
    }
  }
  const full = (v: number[]) => {
    const out = new Array<number>(nodeCount).fill(0);
    capNodes.forEach((n, i) => (out[n] = v[i]!));
    for (const n of resOnly) {
      let g = 0;
      let s = 0;
      for (const r of resistors) {
        const other = r.a === n ? r.b : r.b === n ? r.a : -1;
        if (other >= 0) {
          g += 1 / r.value;
          s += out[other]! / r.value;
        }
      }
      out[n] = s / g;
    }
    return out;
  };
  const deriv = (v: number[]) => {
    const u = full(v);
    const inj = capNodes.map(() => 0);
    for (const r of resistors) {
      const i = (u[r.a]! - u[r.b]!) / r.value;
      const ia = idx.get(r.a);
      const ib = idx.get(r.b);
      if (ia !== undefined) inj[ia]! -= i;
      if (ib !== undefined) inj[ib]! += i;
    }
    return solve(cm, inj);
  };
  const worst = (v: number[]) => {
    const u = full(v);
    return Math.max(...caps.map((c) => Math.abs(u[c.a]! - u[c.b]!)));
  };
  let v = capNodes.map((n) => v0[n]! - v0[0]!);
  let t = 0;
  let w = worst(v);
  while (t < maxS) {
    if (w <= thresholdV) return t;
    const k1 = deriv(v);
    const k2 = deriv(v.map((x, i) => x + (dtS / 2) * k1[i]!));
    const k3 = deriv(v.map((x, i) => x + (dtS / 2) * k2[i]!));
    const k4 = deriv(v.map((x, i) => x + dtS * k3[i]!));
    const next = v.map((x, i) => x + (dtS / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!));
    const wn = worst(next);
    if (wn <= thresholdV) return t + (dtS * (w - thresholdV)) / (w - wn);
    v = next;
    w = wn;
    t += dtS;
  }
  return Number.POSITIVE_INFINITY;
}
