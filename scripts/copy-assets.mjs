// The build copies the tablet page's static files next to the compiled plugin (dist/form/).
import { cpSync, mkdirSync } from "node:fs";

mkdirSync("dist/form", { recursive: true });
for (const file of ["index.html", "form.css", "form.js"]) cpSync(`src/form/${file}`, `dist/form/${file}`);
