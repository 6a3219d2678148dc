#!/usr/bin/env node
// Entry of the `cpet` command: runs the TypeScript CLI through tsx (a runtime dependency).
import { tsImport } from "tsx/esm/api";

await tsImport("../cli/cpet.ts", import.meta.url);
