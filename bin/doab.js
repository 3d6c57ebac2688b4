#!/usr/bin/env node
// The installed entry point runs the compiled CLI (npm run build writes dist/).
import '../dist/cli/entry.js';
