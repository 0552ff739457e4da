/**
 * PDF text through the built-in Helvetica fonts, which only carry the WinAnsi (cp1252) characters:
 * symbols outside it are spelled out ("phi", "sqrt", "<="), anything else unknown becomes "?".
 */

const SPELLED: Record<string, string> = {
  "φ": "phi", "Φ": "Phi", "√": "sqrt", "²": "^2", "³": "^3", "≤": "<=", "≥": ">=", "Σ": "Sum ", "∑": "Sum ",
  "₀": "0", "₁": "1", "₂": "2", "₃": "3", "₄": "4", "₅": "5", "₆": "6", "₇": "7", "₈": "8", "₉": "9",
  "−": "-", "∥": "||", "Δ": "delta ", "≈": "~", "→": "->", "←": "<-", "∞": "inf", "ω": "omega", "π": "pi",
  "≠": "!=", "∙": "·", "θ": "theta", "Ω": "ohm", "‑": "-", "\u2009": " ", "\u202F": " ", "\u2002": " ", "\u2003": " ",
};

/** The cp1252 characters in 0x80–0x9F, which WinAnsi encodes besides Latin-1. */
const CP1252_EXTRA = new Set("€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ");

export function isWinAnsi(ch: string): boolean {
  const c = ch.codePointAt(0) as number;
  return (c >= 0x20 && c <= 0x7e) || (c >= 0xa0 && c <= 0xff) || CP1252_EXTRA.has(ch) || ch === "\n";
}

export function pdfSafe(text: string): string {
  let out = "";
  // "√3" reads "sqrt(3)", not "sqrt3"; "√(…)" already has its parentheses.
  for (const ch of text.replace(/√([\w.]+)/g, "sqrt($1)")) {
    const spelled = SPELLED[ch];
    if (spelled !== undefined) out += spelled;
    else if (isWinAnsi(ch)) out += ch;
    else if (ch === "\t" || ch === "\r") out += " ";
    else out += "?";
  }
  return out;
}
