#!/usr/bin/env node
// Entry point of the `rollway` command: runs the TypeScript sources through tsx's loader, so
// the repo needs no build step for the CLI.
import { register } from 'tsx/esm/api';

// tsconfig.json maps 'odex' to its type declarations for the type checker only; at run time
// the real package must load, so tsx is told not to apply that mapping.
register({ tsconfig: false });
await import('./index.ts');
