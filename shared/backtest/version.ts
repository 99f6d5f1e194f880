/** Stored with every snapshot so a frozen figure can be traced to the engine that made it. */
export const ENGINE_VERSION = "1.1.0";
