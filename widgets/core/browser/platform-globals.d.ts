// Engine code reached from the browser bundles (src/tolerance/run.ts) yields with setImmediate
// where the platform has it, after checking with typeof; browsers type-check it without Node's
// types, so the name is declared here.
declare function setImmediate(callback: () => void): unknown;
