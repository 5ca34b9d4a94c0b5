//! The Caloris language server: the compiler's one analysis ([`caloris_compiler::analyze`])
//! mapped to editor features over the Language Server Protocol.
//!
//! The server holds no parsing and no physics. Each open document is analysed on a blocking
//! thread by its own worker task (see [`documents`]); every feature is a function from an
//! analysed [`snapshot::Snapshot`] and a position to protocol values, one module per feature,
//! so the features can be tested without a running server.

pub mod code_actions;
pub mod completion;
pub mod diagnostics;
pub mod display;
pub mod documents;
pub mod formatting;
pub mod hover;
pub mod hover_transient;
pub mod inlay_hints;
pub mod isolate;
pub mod link_figures;
pub mod loader;
pub mod navigation;
pub mod proto;
pub mod rename;
pub mod semantic_tokens;
pub mod server;
pub mod settings;
pub mod signature_help;
pub mod snapshot;
pub mod symbols;
pub mod worker;
pub mod workspace;

use tokio::io::{AsyncRead, AsyncWrite};
use tower_lsp_server::{LspService, Server};

/// Serve one client over the given byte streams until it sends `exit` or closes the input.
pub async fn serve<I, O>(input: I, output: O)
where
    I: AsyncRead + Unpin,
    O: AsyncWrite,
{
    let (service, socket) = LspService::new(server::Backend::new);
    Server::new(input, output, socket).serve(service).await;
}

/// Run the server over standard input and output, as `caloris lsp` does. Returns when the
/// client exits.
pub fn run_stdio() -> std::io::Result<()> {
    let runtime = tokio::runtime::Builder::new_multi_thread()
        .enable_all()
        // Requests read and drop syntax trees on these threads; give them the main thread's
        // usual stack rather than the 2 MB default. Analyses get their own (see `isolate`).
        .thread_stack_size(8 * 1024 * 1024)
        .build()?;
    runtime.block_on(serve(tokio::io::stdin(), tokio::io::stdout()));
    // The client has gone (`exit`, or its end of the pipes closed). An analysis still running
    // on a blocking thread has no one to report to, and dropping the runtime would wait for it
    // (a large model takes seconds to minutes): leave it to end with the process.
    runtime.shutdown_background();
    Ok(())
}
