/**
 * The `veer` process: runs the CLI with this process's arguments and sets the exit code. bin/veer.js loads the
 * bundled compiled form (dist/cli-bundle/run.js); tests and development run this file from the sources with tsx.
 */
import { main } from './main.ts';

process.exitCode = await main(process.argv.slice(2));
