// Unit test of out/extension.js without VS Code: the `vscode` and
// `vscode-languageclient/node` modules are replaced by fakes that record how
// the extension uses them. Run after `tsc`: node test/extension.test.js
"use strict";
const assert = require("assert");
const Module = require("module");

const config = {
  path: "/opt/circa/bin/circa",
  "methods.voidFraction": "zivi",
  "methods.friction": "",
  limits: { exit_quality: "0.4", tilt_margin: " 8 deg ", flooding: "" },
  "inlayHints.enabled": false,
  "inlayHints.ranges": true,
  marginChecks: "never",
};
const record = { clients: [], notifications: [], commands: {}, configListeners: [], errors: [] };

const vscode = {
  workspace: {
    getConfiguration(section) {
      assert.strictEqual(section, "circa");
      return { get: (key, def) => (key in config ? config[key] : def) };
    },
    createFileSystemWatcher: (glob) => ({ glob, dispose() {} }),
    onDidChangeConfiguration(fn) {
      record.configListeners.push(fn);
      return { dispose() {} };
    },
  },
  commands: {
    registerCommand(name, fn) {
      record.commands[name] = fn;
      return { dispose() {} };
    },
  },
  window: { showErrorMessage: (m) => record.errors.push(m) },
};

class LanguageClient {
  constructor(id, name, serverOptions, clientOptions) {
    Object.assign(this, { id, name, serverOptions, clientOptions, started: false, stopped: false });
    record.clients.push(this);
  }
  async start() { this.started = true; }
  async stop() { this.stopped = true; }
  async sendNotification(method, params) { record.notifications.push({ method, params }); }
}
const languageclient = { LanguageClient, TransportKind: { stdio: 0 } };

const resolve = Module._resolveFilename;
Module._resolveFilename = function (request, ...rest) {
  if (request === "vscode" || request === "vscode-languageclient/node") return request;
  return resolve.call(this, request, ...rest);
};
require.cache.vscode = { id: "vscode", filename: "vscode", loaded: true, exports: vscode };
require.cache["vscode-languageclient/node"] = { id: "lc", filename: "lc", loaded: true, exports: languageclient };

const ext = require("../out/extension.js");

(async () => {
  const context = { subscriptions: [] };
  await ext.activate(context);
  assert.deepStrictEqual(record.errors, []);
  assert.strictEqual(record.clients.length, 1, "one client started");
  const c = record.clients[0];
  assert.ok(c.started);
  for (const mode of ["run", "debug"]) {
    assert.strictEqual(c.serverOptions[mode].command, "/opt/circa/bin/circa");
    assert.deepStrictEqual(c.serverOptions[mode].args, ["serve"]);
  }
  assert.deepStrictEqual(c.clientOptions.documentSelector.map((d) => d.language), ["loop", "loop"]);
  const want = {
    voidFraction: "zivi",
    friction: "",
    limits: { exit_quality: "0.4", tilt_margin: "8 deg" },
    inlayHints: false,
    rangeHints: true,
    marginChecks: "never",
  };
  assert.deepStrictEqual(c.clientOptions.initializationOptions, want);

  // A settings change is sent to the running server under "circa".
  config["methods.friction"] = "friedel";
  const affects = (s) => s === "circa" || s === "circa.methods.friction";
  for (const fn of record.configListeners) await fn({ affectsConfiguration: affects });
  assert.strictEqual(record.notifications.length, 1);
  assert.strictEqual(record.notifications[0].method, "workspace/didChangeConfiguration");
  assert.deepStrictEqual(record.notifications[0].params, { settings: { circa: { ...want, friction: "friedel" } } });

  // A new circa.path restarts the server with it.
  config.path = "/usr/local/bin/circa";
  const pathChange = (s) => s === "circa" || s === "circa.path";
  for (const fn of record.configListeners) await fn({ affectsConfiguration: pathChange });
  assert.strictEqual(record.clients.length, 2);
  assert.ok(c.stopped, "old client stopped");
  assert.strictEqual(record.clients[1].serverOptions.run.command, "/usr/local/bin/circa");

  // Other extensions' settings are ignored.
  for (const fn of record.configListeners) await fn({ affectsConfiguration: () => false });
  assert.strictEqual(record.notifications.length, 1);

  // An empty path falls back to "circa"; the restart command works.
  config.path = "";
  await record.commands["circa.restartServer"]();
  assert.strictEqual(record.clients[2].serverOptions.run.command, "circa");

  await ext.deactivate();
  assert.ok(record.clients[2].stopped);
  console.log("extension tests passed");
})().catch((e) => {
  console.error(e);
  process.exit(1);
});
