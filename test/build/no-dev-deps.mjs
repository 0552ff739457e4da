// node --import ./no-dev-deps.mjs: registers the hooks that refuse dev dependencies to the compiled tree.
import { register } from "node:module";

register("./no-dev-deps-hooks.mjs", import.meta.url);
