#!/usr/bin/env node
// A stand-in language server for the editor checks (the real one is `caloris lsp`).
// Speaks LSP over stdio, answers initialize/shutdown, and appends the method of
// every message it receives to the file named by $FAKE_LSP_LOG (one per line).
"use strict";
const fs = require("node:fs");

const log = process.env.FAKE_LSP_LOG;
function record(line) {
  if (log) fs.appendFileSync(log, line + "\n");
}

function send(msg) {
  const body = Buffer.from(JSON.stringify({ jsonrpc: "2.0", ...msg }), "utf8");
  process.stdout.write(`Content-Length: ${body.length}\r\n\r\n`);
  process.stdout.write(body);
}

function handle(msg) {
  record(msg.method !== undefined ? msg.method : "(response)");
  switch (msg.method) {
    case "initialize":
      send({
        id: msg.id,
        result: {
          capabilities: { textDocumentSync: 1, hoverProvider: true },
          serverInfo: { name: "fake-caloris-lsp", version: "0" },
        },
      });
      break;
    case "shutdown":
      send({ id: msg.id, result: null });
      break;
    case "exit":
      process.exit(0);
      break;
    case "textDocument/hover":
      send({ id: msg.id, result: { contents: { kind: "plaintext", value: "fake hover" } } });
      break;
    default:
      if (msg.id !== undefined && msg.method !== undefined) {
        send({ id: msg.id, error: { code: -32601, message: `unhandled: ${msg.method}` } });
      }
  }
}

let buf = Buffer.alloc(0);
process.stdin.on("data", (chunk) => {
  buf = Buffer.concat([buf, chunk]);
  for (;;) {
    const sep = buf.indexOf("\r\n\r\n");
    if (sep < 0) return;
    const header = buf.subarray(0, sep).toString("ascii");
    const m = /Content-Length:\s*(\d+)/i.exec(header);
    if (!m) { buf = buf.subarray(sep + 4); continue; }
    const len = Number(m[1]);
    if (buf.length < sep + 4 + len) return;
    const body = buf.subarray(sep + 4, sep + 4 + len).toString("utf8");
    buf = buf.subarray(sep + 4 + len);
    handle(JSON.parse(body));
  }
});
process.stdin.on("end", () => process.exit(0));
