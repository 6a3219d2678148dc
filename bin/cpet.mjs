#!/usr/bin/env node
// Entry of the `cpet` command: runs the TypeScript CLI through tsx (a runtime dependency).
import Module from "node:module";
import { fileURLToPath } from "node:url";

// The database layer (lib/store) marks itself "server-only" for the web app's bundler, which resolves that marker; here
// it resolves to an empty module. Set before tsx loads, so tsx's resolver passes the name on to this one.
const stub = fileURLToPath(new URL("./server-only-stub.cjs", import.meta.url));
const resolveFilename = Module._resolveFilename;
Module._resolveFilename = function (request, ...rest) {
  return request === "server-only" ? stub : resolveFilename.call(this, request, ...rest);
};

const { tsImport } = await import("tsx/esm/api");
await tsImport("../cli/cpet.ts", import.meta.url);
