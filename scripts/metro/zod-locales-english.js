// What the web bundle gets for zod's `locales` namespace (metro.config.js): English only. zod's index exports all
// of its ~60 translations of its own error messages (about 280 kB of the entry bundle before compression, a
// sixth of it), which every page would download; the app words its own messages and configures no other
// language. `z.locales.<other>` is undefined in the app because of this.
export { default as en } from 'zod/v4/locales/en.js';
