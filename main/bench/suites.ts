// The benchmark suites `npm run bench` runs, one file each under suites/.
import type { BenchSuite } from './suite';

export const suites: readonly BenchSuite[] = [];
