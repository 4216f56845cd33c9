// The web app runs under a Content-Security-Policy without 'unsafe-eval' (sync-server/src/middleware/
// content-security-policy.ts). zod 4 probes `new Function("")` when it creates an object schema, to decide
// whether to compile faster parsers; under the policy the browser refuses the probe and reports a violation.
// Jitless mode skips the probe and always uses zod's interpreted parsers, which give the same results. Imported
// first by the app's entry (index.ts), since the probe runs when a schema is created.
import { z } from 'zod';

z.config({ jitless: true });
