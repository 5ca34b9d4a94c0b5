// Smoke test: the esbuild bundle (dist/extension.js) loads outside VS Code with a
// stand-in `vscode` module and exports activate/deactivate. Skipped before bundling.
"use strict";
const test = require("node:test");
const assert = require("node:assert/strict");
const fs = require("node:fs");
const path = require("node:path");
const Module = require("node:module");

const bundle = path.join(__dirname, "..", "dist", "extension.js");

test("dist/extension.js loads and exports activate/deactivate", { skip: !fs.existsSync(bundle) && "not bundled yet" }, () => {
  // Every property of the stand-in is a class whose properties are again such classes.
  const anything = () => {
    const c = class {};
    return new Proxy(c, { get: (t, k) => (k in t ? t[k] : typeof k === "symbol" ? undefined : anything()) });
  };
  const stub = new Proxy({}, { get: (_t, k) => (k === "__esModule" ? false : anything()) });
  const load = Module._load;
  Module._load = function (request, ...rest) {
    return request === "vscode" ? stub : load.call(this, request, ...rest);
  };
  try {
    const ext = require(bundle);
    assert.equal(typeof ext.activate, "function");
    assert.equal(typeof ext.deactivate, "function");
  } finally {
    Module._load = load;
  }
});
