// Module resolution hooks for the compiled-tools test: a module under the compiled tree that imports one of
// package.json's devDependencies fails to load, as it would in the image, where `npm prune --omit=dev` removed them.
import { readFileSync } from "node:fs";

const pkg = JSON.parse(readFileSync(new URL("../../package.json", import.meta.url), "utf8"));
const devOnly = Object.keys(pkg.devDependencies ?? {}).filter((name) => !(name in (pkg.dependencies ?? {})));
const compiledRoot = process.env.PFC_COMPILED_ROOT ?? "";

export async function resolve(specifier, context, nextResolve) {
  const resolved = await nextResolve(specifier, context);
  const fromCompiled = compiledRoot !== "" && (context.parentURL ?? "").startsWith(compiledRoot);
  const devDep = devOnly.find((name) => resolved.url.includes(`/node_modules/${name}/`));
  if (fromCompiled && devDep) throw new Error(`${context.parentURL} imports the dev dependency ${devDep}`);
  return resolved;
}
