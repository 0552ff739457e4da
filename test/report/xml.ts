/**
 * A small strict well-formedness check for the SVG the report writes (XML 1.0 subset: elements, attributes in
 * quotes, the five named entities and numeric references, comments). Returns the problems found; [] is well formed.
 */
export interface XmlElement {
  name: string;
  attrs: Record<string, string>;
  children: XmlElement[];
  text: string;
}

const NAME = /^[A-Za-z_][\w.:-]*$/;
const ENTITY = /&(?:amp|lt|gt|quot|apos|#\d+|#x[0-9A-Fa-f]+);/y;

function checkText(s: string, where: string, problems: string[]): void {
  for (let i = 0; i < s.length; i++) {
    if (s[i] === "<") problems.push(`${where}: bare "<"`);
    if (s[i] === "&") {
      ENTITY.lastIndex = i;
      if (!ENTITY.test(s)) problems.push(`${where}: bad entity at ${JSON.stringify(s.slice(i, i + 10))}`);
    }
  }
}

const decode = (s: string) =>
  s.replace(/&(amp|lt|gt|quot|apos|#\d+|#x[0-9A-Fa-f]+);/g, (_, e: string) =>
    e === "amp"
      ? "&"
      : e === "lt"
        ? "<"
        : e === "gt"
          ? ">"
          : e === "quot"
            ? '"'
            : e === "apos"
              ? "'"
              : String.fromCodePoint(e[1] === "x" ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10)),
  );

export function parseXml(xml: string): { root: XmlElement | null; problems: string[] } {
  const problems: string[] = [];
  const stack: XmlElement[] = [];
  let root: XmlElement | null = null;
  let i = 0;
  while (i < xml.length) {
    const lt = xml.indexOf("<", i);
    const textEnd = lt < 0 ? xml.length : lt;
    const txt = xml.slice(i, textEnd);
    if (txt.trim().length > 0) {
      if (stack.length === 0) problems.push(`text outside the root: ${JSON.stringify(txt.slice(0, 20))}`);
      checkText(txt, "text", problems);
      const top = stack[stack.length - 1];
      if (top) top.text += decode(txt);
    }
    if (lt < 0) break;
    if (xml.startsWith("<!--", lt)) {
      const end = xml.indexOf("-->", lt + 4);
      if (end < 0) return { root, problems: [...problems, "unterminated comment"] };
      i = end + 3;
      continue;
    }
    const gt = xml.indexOf(">", lt);
    if (gt < 0) return { root, problems: [...problems, "unterminated tag"] };
    const tag = xml.slice(lt + 1, gt);
    if (tag.startsWith("/")) {
      const name = tag.slice(1).trim();
      const open = stack.pop();
      if (!open || open.name !== name) problems.push(`closing </${name}> does not match <${open?.name ?? "nothing"}>`);
    } else {
      const selfClosing = tag.endsWith("/");
      const body = selfClosing ? tag.slice(0, -1) : tag;
      const m = /^([^\s/>]+)([\s\S]*)$/.exec(body);
      const name = m?.[1] ?? "";
      if (!NAME.test(name)) problems.push(`bad element name ${JSON.stringify(name)}`);
      const attrs: Record<string, string> = {};
      let rest = (m?.[2] ?? "").trim();
      while (rest.length > 0) {
        const a = /^([A-Za-z_][\w.:-]*)\s*=\s*("([^"<]*)"|'([^'<]*)')\s*/.exec(rest);
        if (!a) {
          problems.push(`<${name}>: bad attribute syntax near ${JSON.stringify(rest.slice(0, 30))}`);
          break;
        }
        const key = a[1] as string;
        const value = a[3] ?? a[4] ?? "";
        if (key in attrs) problems.push(`<${name}>: duplicate attribute ${key}`);
        checkText(value, `<${name} ${key}>`, problems);
        attrs[key] = decode(value);
        rest = rest.slice(a[0].length);
      }
      const el: XmlElement = { name, attrs, children: [], text: "" };
      const parent = stack[stack.length - 1];
      if (parent) parent.children.push(el);
      else if (root) problems.push("more than one root element");
      else root = el;
      if (!selfClosing) stack.push(el);
    }
    i = gt + 1;
  }
  if (stack.length > 0) problems.push(`unclosed elements: ${stack.map((e) => e.name).join(", ")}`);
  if (!root) problems.push("no root element");
  return { root, problems };
}

export function descendants(el: XmlElement, pred: (e: XmlElement) => boolean): XmlElement[] {
  const out: XmlElement[] = [];
  const walk = (e: XmlElement) => {
    if (pred(e)) out.push(e);
    e.children.forEach(walk);
  };
  walk(el);
  return out;
}

/** The raw <svg>…</svg> substrings of an HTML document (the report writes them verbatim). */
export function svgStrings(html: string): string[] {
  return [...html.matchAll(/<svg[\s>][\s\S]*?<\/svg>/g)].map((m) => m[0]);
}
