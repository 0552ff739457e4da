/** Bumped whenever a change to the engine can change a stored result. Stored with every survey. */
export const ENGINE_VERSION = "2.0.0";
