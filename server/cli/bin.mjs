#!/usr/bin/env node
// npx epochwright …: Node 20 cannot run TypeScript itself, so load tsx's loader first.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('./main.ts');
process.exitCode = await main(process.argv.slice(2));
