// The app's entry. zod is configured before anything else runs (features/root/zod-config.ts): expo-router evaluates every
// route module at start-up, and zod builds an object schema's parser when the schema is created, so a setting
// made later (in the root layout) comes after the first schemas have already probed for eval under the CSP.
import './features/root/zod-config';
import 'expo-router/entry';
