// The build copies the tablet page's static files next to the compiled plugin (dist/form/): files.json and
// every file it lists, the same list the service serves and the page's service worker caches.
import { cpSync, mkdirSync, readFileSync } from "node:fs";

const list = JSON.parse(readFileSync("src/form/files.json", "utf8"));
mkdirSync("dist/form", { recursive: true });
for (const file of ["files.json", list.page, list.worker, ...list.files]) cpSync(`src/form/${file}`, `dist/form/${file}`);
