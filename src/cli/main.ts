#!/usr/bin/env node
/** Entry point of the `steadyfold` command; everything else is in app.ts. */
import { hideBin } from 'yargs/helpers';
import { main } from './app.js';

main(hideBin(process.argv)).then((code) => {
  process.exitCode = code;
});
