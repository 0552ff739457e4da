/** Bumped whenever a change to the engine can change a stored result. Stored with every survey. */
export const ENGINE_VERSION = "1.0.0";
