// The benchmark suites `npm run bench` runs, one file each under suites/.
import type { BenchSuite } from './suite';
import { inferenceSuite } from './suites/inference';

export const suites: readonly BenchSuite[] = [inferenceSuite];
