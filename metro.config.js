// Metro needs wasm as an asset so expo-sqlite's web build (wa-sqlite.wasm) bundles, and woff2 for the web
// target's fonts (features/root/app-fonts.web.ts).
const path = require('node:path');
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
config.resolver.assetExts.push('wasm', 'woff2');
config.resolver.blockList = [/\/\.data\/.*/, /\/artifacts\/.*/, /\/sync-server\/.*/];

// zod's classic and core indexes re-export every translation zod ships; the app loads English only
// (scripts/metro/zod-locales-english.js).
const zodIndexes = ['classic/external.js', 'core/index.js'].map((file) =>
  path.join(`${path.sep}node_modules`, 'zod', 'v4', file),
);
const englishOnly = path.join(__dirname, 'scripts/metro/zod-locales-english.js');
config.resolver.resolveRequest = (context, moduleName, platform) => {
  if (
    moduleName === '../locales/index.js' &&
    zodIndexes.some((index) => context.originModulePath.endsWith(index))
  )
    return { type: 'sourceFile', filePath: englishOnly };
  return context.resolveRequest(context, moduleName, platform);
};

module.exports = config;
