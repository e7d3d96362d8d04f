import { testEnv } from './test-env.js';

// Runs before each test file's imports, so server/config.ts reads the test services.
Object.assign(process.env, testEnv);
