#!/usr/bin/env node
// The nappe command: runs headless/cli.ts through tsx's loader (no build step needed).
import { register } from "tsx/esm/api";

register();
await import("../headless/cli.ts");
