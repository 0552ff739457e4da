/** Minimal complex arithmetic for impedances; values are immutable, every operation returns a new one. */

export interface Complex {
  readonly re: number;
  readonly im: number;
}

export function complex(re: number, im = 0): Complex {
  return { re, im };
}

export function cAdd(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

export function cMul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** Smith's algorithm: avoids overflow/underflow of |b|² when parts differ by many decades. */
export function cDiv(a: Complex, b: Complex): Complex {
  if (b.re === 0 && b.im === 0) throw new RangeError("complex division by zero");
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const r = b.im / b.re;
    const d = b.re + b.im * r;
    return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
  }
  const r = b.re / b.im;
  const d = b.re * r + b.im;
  return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

export function cAbs(a: Complex): number {
  return Math.hypot(a.re, a.im);
}

/** Two impedances in parallel, a·b/(a+b); a zero-impedance branch shorts the pair. */
export function cParallel(a: Complex, b: Complex): Complex {
  if ((a.re === 0 && a.im === 0) || (b.re === 0 && b.im === 0)) return complex(0, 0);
  return cDiv(cMul(a, b), cAdd(a, b));
}
