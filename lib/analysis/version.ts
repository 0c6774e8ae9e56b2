/**
 * Version of the analysis engine, stored with every run so results can be traced to the code
 * that produced them. Bump it whenever a change alters any figure the engine reports.
 */
export const ENGINE_VERSION = "1.3.2";
