// The circa extension: starts `circa serve` for .loop files and passes the
// user's settings to it, at start-up and whenever they change.
import * as vscode from "vscode";
import {
  LanguageClient,
  LanguageClientOptions,
  ServerOptions,
  TransportKind,
} from "vscode-languageclient/node";

let client: LanguageClient | undefined;

// serverSettings gathers the settings `circa serve` reads (see docs/lsp.md):
// correlation choices, margin limits by field name, inlay hints and when
// to run the margin rules.
export function serverSettings(): Record<string, unknown> {
  const c = vscode.workspace.getConfiguration("circa");
  const limits: Record<string, string> = {};
  for (const [k, v] of Object.entries(c.get<Record<string, unknown>>("limits", {}) ?? {})) {
    if (typeof v === "string" && v.trim() !== "") {
      limits[k] = v.trim();
    } else if (typeof v === "number") {
      limits[k] = String(v);
    }
  }
  return {
    voidFraction: c.get<string>("methods.voidFraction", ""),
    friction: c.get<string>("methods.friction", ""),
    limits,
    inlayHints: c.get<boolean>("inlayHints.enabled", true),
    rangeHints: c.get<boolean>("inlayHints.ranges", false),
    marginChecks: c.get<string>("marginChecks", "auto"),
  };
}

async function start(context: vscode.ExtensionContext): Promise<void> {
  const command = vscode.workspace.getConfiguration("circa").get<string>("path", "circa") || "circa";
  const serverOptions: ServerOptions = {
    run: { command, args: ["serve"], transport: TransportKind.stdio },
    debug: { command, args: ["serve"], transport: TransportKind.stdio },
  };
  const clientOptions: LanguageClientOptions = {
    documentSelector: [{ scheme: "file", language: "loop" }, { scheme: "untitled", language: "loop" }],
    initializationOptions: serverSettings(),
    synchronize: {
      fileEvents: vscode.workspace.createFileSystemWatcher("**/*.{loop,csv}"),
    },
    outputChannelName: "circa",
  };
  client = new LanguageClient("circa", "circa", serverOptions, clientOptions);
  await client.start();
}

async function restart(context: vscode.ExtensionContext): Promise<void> {
  if (client) {
    await client.stop();
    client = undefined;
  }
  await start(context);
}

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  context.subscriptions.push(
    vscode.commands.registerCommand("circa.restartServer", () => restart(context)),
    vscode.workspace.onDidChangeConfiguration(async (e) => {
      if (!e.affectsConfiguration("circa")) {
        return;
      }
      if (e.affectsConfiguration("circa.path")) {
        await restart(context);
        return;
      }
      await client?.sendNotification("workspace/didChangeConfiguration", {
        settings: { circa: serverSettings() },
      });
    }),
  );
  try {
    await start(context);
  } catch (err) {
    vscode.window.showErrorMessage(
      `circa: could not start "${vscode.workspace.getConfiguration("circa").get("path")} serve": ${err}. ` +
        "Set circa.path to the circa binary.",
    );
  }
}

export async function deactivate(): Promise<void> {
  if (client) {
    await client.stop();
    client = undefined;
  }
}
