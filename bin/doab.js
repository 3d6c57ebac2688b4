#!/usr/bin/env node
// The installed entry point runs the compiled CLI (npm run build writes dist/).
import { main } from '../dist/cli/main.js';

process.exitCode = await main(process.argv.slice(2));
