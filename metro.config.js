// Metro needs wasm as an asset so expo-sqlite's web build (wa-sqlite.wasm) bundles.
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
config.resolver.assetExts.push('wasm');
config.resolver.blockList = [/\/\.data\/.*/, /\/artifacts\/.*/, /\/sync-server\/.*/];

module.exports = config;
