/** The package version; a test keeps it equal to package.json. Written into every export. */
export const QUIETFRAME_VERSION = "0.1.0";
