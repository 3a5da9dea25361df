#!/usr/bin/env node
// Launcher for the `levelwise` command line. The command line is written in TypeScript
// (src/cli/main.ts) and runs through tsx's loader, so a fresh clone needs no build step.
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

const tsconfig = fileURLToPath(new URL('../tsconfig.json', import.meta.url));
register({ tsconfig });
const { main } = await import(new URL('../src/cli/main.ts', import.meta.url).href);
process.exitCode = await main(process.argv.slice(2));
