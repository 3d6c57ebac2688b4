import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);
// src/shared and dist/shared both sit two folders below package.json
export const VERSION: string = (require('../../package.json') as { version: string }).version;
