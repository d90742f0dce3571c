// The benchmark suites `npm run bench` runs, one file each under suites/.
import type { BenchSuite } from './suite';
import { inferenceSuite } from './suites/inference';
import { intakeSuite } from './suites/intake';
import { riskSuite } from './suites/risk';
import { appSuite } from './suites/app';
import { historySuite } from './suites/history';
import { bundleSuite } from './suites/bundle';
import { reportSuite } from './suites/report';

export const suites: readonly BenchSuite[] = [intakeSuite, riskSuite, inferenceSuite, appSuite, historySuite, bundleSuite, reportSuite];
