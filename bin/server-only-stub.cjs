// Stand-in for the "server-only" marker outside the web app's bundler (see bin/cpet.mjs).
module.exports = {};
