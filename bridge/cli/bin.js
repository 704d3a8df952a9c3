#!/usr/bin/env node
// `bin` entry: runs the TypeScript CLI through tsx's loader.
import { register } from 'tsx/esm/api';
register();
await import('./main.ts');
