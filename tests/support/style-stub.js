// Stylesheets (a component package's CSS) mean nothing to component tests in Node: each imports as empty.
module.exports = {};
