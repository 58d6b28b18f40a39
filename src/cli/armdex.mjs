#!/usr/bin/env node
// Entry point for `npx armdex`: registers tsx so the TypeScript CLI runs directly on Node 20.
import { register } from "tsx/esm/api";

register();
await import("./armdex.ts");
