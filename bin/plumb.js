#!/usr/bin/env node
import { execute } from '../dist/src/cli/main.js';
process.exitCode = await execute(process.argv.slice(2));
