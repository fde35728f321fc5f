// Entry point of the command line (bin/osmia runs this file, or its bundle).
import { run } from './cli.ts';

run();
