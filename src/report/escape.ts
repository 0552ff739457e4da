/** Text to HTML/XML: the five characters with meaning in markup become entities; control characters are dropped. */
export function escapeHtml(value: string): string {
  return (
    value
      // eslint-disable-next-line no-control-regex -- dropping control characters is the point
      .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/g, "")
      .replace(/&/g, "&amp;")
      .replace(/</g, "&lt;")
      .replace(/>/g, "&gt;")
      .replace(/"/g, "&quot;")
      .replace(/'/g, "&#39;")
  );
}

/** An identifier safe in an id attribute and in a CSS selector. */
export function slug(value: string): string {
  return (
    value
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "") || "x"
  );
}
