// VS Code client for the Caloris language server (`caloris lsp`, stdio).
import * as vscode from "vscode";
import {
  Executable,
  LanguageClient,
  LanguageClientOptions,
  ServerOptions,
  TransportKind,
} from "vscode-languageclient/node";

let client: LanguageClient | undefined;
let outputChannel: vscode.OutputChannel | undefined;

function serverExecutable(): Executable {
  const config = vscode.workspace.getConfiguration("caloris");
  const command = config.get<string>("server.path", "caloris").trim() || "caloris";
  const extraArgs = config.get<string[]>("server.extraArgs", []);
  return {
    command,
    args: ["lsp", ...extraArgs],
    transport: TransportKind.stdio,
    options: { env: process.env },
  };
}

async function startClient(): Promise<void> {
  const exe = serverExecutable();
  const serverOptions: ServerOptions = { run: exe, debug: exe };
  if (!outputChannel) {
    outputChannel = vscode.window.createOutputChannel("Caloris");
  }
  const clientOptions: LanguageClientOptions = {
    documentSelector: [
      { scheme: "file", language: "heat" },
      { scheme: "untitled", language: "heat" },
    ],
    outputChannel,
    synchronize: {
      fileEvents: vscode.workspace.createFileSystemWatcher("**/*.heat"),
    },
  };
  client = new LanguageClient("caloris", "Caloris", serverOptions, clientOptions);
  try {
    await client.start();
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    const choice = await vscode.window.showErrorMessage(
      `Caloris: could not start the language server "${exe.command} ${(exe.args ?? []).join(" ")}": ${message}. ` +
        "Check that `caloris` is on your PATH or set `caloris.server.path`.",
      "Open Settings",
    );
    if (choice === "Open Settings") {
      void vscode.commands.executeCommand("workbench.action.openSettings", "caloris.server");
    }
  }
}

async function stopClient(): Promise<void> {
  const running = client;
  client = undefined;
  if (running) {
    try {
      await running.stop();
    } catch {
      // The server may already be gone; nothing else to do.
    }
  }
}

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  context.subscriptions.push(
    vscode.commands.registerCommand("caloris.restartServer", async () => {
      await stopClient();
      await startClient();
    }),
    vscode.workspace.onDidChangeConfiguration(async (event) => {
      if (
        event.affectsConfiguration("caloris.server.path") ||
        event.affectsConfiguration("caloris.server.extraArgs")
      ) {
        await stopClient();
        await startClient();
      }
    }),
  );
  await startClient();
}

export async function deactivate(): Promise<void> {
  await stopClient();
}
