// The require() side of scripts/server-env.mjs: command-line scripts that tsx loads as
// CommonJS may import modules marked "server-only" too.
const Module = require("node:module");
const path = require("node:path");

const resolveFilename = Module._resolveFilename;
Module._resolveFilename = function resolveServerOnly(request, ...rest) {
  if (request === "server-only") return path.join(__dirname, "empty-module.mjs");
  return resolveFilename.call(this, request, ...rest);
};
