//! The protocol front: capabilities, and each request answered from the newest analysis of the
//! document by the feature modules.

use crate::documents::{Documents, Need};
use crate::navigation::{self, SymbolKey};
use crate::proto::{lsp, uri_path};
use crate::settings::Settings;
use crate::snapshot::Snapshot;
use crate::{
    code_actions, completion, hover, inlay_hints, rename, semantic_tokens, signature_help, symbols,
    worker, workspace,
};
use lsp::*;
use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, RwLock};
use std::time::Duration;
use tower_lsp_server::jsonrpc::{Error, Result};
use tower_lsp_server::{Client, LanguageServer};

/// How long a request waits for the analysis of the current text.
const WAIT_CHECKED: Duration = Duration::from_secs(10);
/// How long a request that shows solved values waits for the solve before answering without.
const WAIT_SOLVED: Duration = Duration::from_secs(5);

/// What the handlers and the document workers share.
#[derive(Default)]
pub struct State {
    pub docs: Documents,
    settings: RwLock<Settings>,
    roots: RwLock<Vec<PathBuf>>,
    inlay_refresh: AtomicBool,
}

impl State {
    pub fn settings(&self) -> Settings {
        self.settings.read().map(|s| s.clone()).unwrap_or_default()
    }
    fn set_settings(&self, value: &serde_json::Value) {
        if let Ok(mut s) = self.settings.write() {
            *s = s.merge(value);
        }
    }
    /// Whether the editor accepts `workspace/inlayHint/refresh`.
    pub fn inlay_refresh(&self) -> bool {
        self.inlay_refresh.load(Ordering::Relaxed)
    }
    fn roots(&self) -> Vec<PathBuf> {
        self.roots.read().map(|r| r.clone()).unwrap_or_default()
    }
}

pub struct Backend {
    client: Client,
    state: Arc<State>,
}

impl Backend {
    pub fn new(client: Client) -> Backend {
        Backend {
            client,
            state: Arc::new(State::default()),
        }
    }

    async fn snapshot(&self, uri: &Uri, need: Need) -> Option<Arc<Snapshot>> {
        let wait = if need == Need::Final {
            WAIT_SOLVED
        } else {
            WAIT_CHECKED
        };
        self.state.docs.snapshot(uri, need, wait).await
    }

    /// Analyses, other than `except`, that may mention names of the file `file`: the other open
    /// documents and the workspace's model files that are not open.
    async fn related(&self, except: &Uri, file: Option<String>) -> Vec<Arc<Snapshot>> {
        let mut out: Vec<Arc<Snapshot>> = self
            .state
            .docs
            .snapshots()
            .into_iter()
            .filter(|s| s.uri.as_str() != except.as_str())
            .collect();
        let closed: Vec<PathBuf> = workspace::heat_files(&self.state.roots())
            .into_iter()
            .filter(|p| !self.state.docs.is_open(p))
            .collect();
        let loader = self.state.docs.loader();
        let more = tokio::task::spawn_blocking(move || workspace::analyze_files(&closed, &loader))
            .await
            .unwrap_or_default();
        out.extend(more);
        if let Some(file) = file {
            out.retain(|s| s.analysis.sources.find(&file).is_some());
        }
        out
    }

    async fn symbol_key(&self, uri: &Uri, pos: Position) -> Option<(Arc<Snapshot>, SymbolKey)> {
        let snap = self.snapshot(uri, Need::Checked).await?;
        let key = navigation::symbol_at(&snap, pos).map(|s| navigation::key(&snap, s))?;
        Some((snap, key))
    }
}

fn capabilities() -> ServerCapabilities {
    ServerCapabilities {
        position_encoding: Some(PositionEncodingKind::UTF16),
        text_document_sync: Some(TextDocumentSyncCapability::Options(
            TextDocumentSyncOptions {
                open_close: Some(true),
                change: Some(TextDocumentSyncKind::FULL),
                save: Some(TextDocumentSyncSaveOptions::SaveOptions(SaveOptions {
                    include_text: Some(false),
                })),
                ..TextDocumentSyncOptions::default()
            },
        )),
        hover_provider: Some(HoverProviderCapability::Simple(true)),
        definition_provider: Some(OneOf::Left(true)),
        references_provider: Some(OneOf::Left(true)),
        rename_provider: Some(OneOf::Right(RenameOptions {
            prepare_provider: Some(true),
            work_done_progress_options: Default::default(),
        })),
        document_symbol_provider: Some(OneOf::Left(true)),
        document_formatting_provider: Some(OneOf::Left(true)),
        workspace_symbol_provider: Some(OneOf::Left(true)),
        completion_provider: Some(CompletionOptions {
            trigger_characters: Some(
                ["(", ",", "°", "/", "*", ":"]
                    .iter()
                    .map(|s| s.to_string())
                    .collect(),
            ),
            ..CompletionOptions::default()
        }),
        signature_help_provider: Some(SignatureHelpOptions {
            trigger_characters: Some(vec!["(".into(), ",".into()]),
            retrigger_characters: Some(vec![" ".into(), "=".into()]),
            work_done_progress_options: Default::default(),
        }),
        semantic_tokens_provider: Some(SemanticTokensServerCapabilities::SemanticTokensOptions(
            SemanticTokensOptions {
                legend: semantic_tokens::legend(),
                full: Some(SemanticTokensFullOptions::Bool(true)),
                range: None,
                work_done_progress_options: Default::default(),
            },
        )),
        code_action_provider: Some(CodeActionProviderCapability::Options(CodeActionOptions {
            code_action_kinds: Some(vec![
                CodeActionKind::QUICKFIX,
                CodeActionKind::REFACTOR_REWRITE,
            ]),
            ..CodeActionOptions::default()
        })),
        inlay_hint_provider: Some(OneOf::Left(true)),
        ..ServerCapabilities::default()
    }
}

impl LanguageServer for Backend {
    async fn initialize(&self, params: InitializeParams) -> Result<InitializeResult> {
        if let Some(opts) = &params.initialization_options {
            self.state.set_settings(opts);
        }
        let mut roots: Vec<PathBuf> = params
            .workspace_folders
            .iter()
            .flatten()
            .filter_map(|f| uri_path(&f.uri))
            .collect();
        #[allow(deprecated)] // Older clients send only `rootUri`.
        if roots.is_empty() {
            roots.extend(params.root_uri.as_ref().and_then(uri_path));
        }
        if let Ok(mut r) = self.state.roots.write() {
            *r = roots;
        }
        let refresh = params
            .capabilities
            .workspace
            .as_ref()
            .and_then(|w| w.inlay_hint.as_ref())
            .and_then(|i| i.refresh_support)
            .unwrap_or(false);
        self.state.inlay_refresh.store(refresh, Ordering::Relaxed);
        Ok(InitializeResult {
            capabilities: capabilities(),
            server_info: Some(ServerInfo {
                name: "caloris".into(),
                version: Some(env!("CARGO_PKG_VERSION").into()),
            }),
            offset_encoding: None,
        })
    }

    async fn shutdown(&self) -> Result<()> {
        Ok(())
    }

    async fn did_open(&self, params: DidOpenTextDocumentParams) {
        let doc = params.text_document;
        if let Some(jobs) = self.state.docs.open(&doc.uri, doc.version, doc.text) {
            tokio::spawn(worker::run(
                self.state.clone(),
                self.client.clone(),
                doc.uri.clone(),
                jobs,
            ));
        }
        self.state.docs.touch_dependents(
            &uri_path(&doc.uri).into_iter().collect::<Vec<_>>(),
            Some(&doc.uri),
        );
    }

    async fn did_change(&self, params: DidChangeTextDocumentParams) {
        let doc = params.text_document;
        if self
            .state
            .docs
            .change(&doc.uri, doc.version, params.content_changes)
        {
            self.state.docs.touch_dependents(
                &uri_path(&doc.uri).into_iter().collect::<Vec<_>>(),
                Some(&doc.uri),
            );
        }
    }

    async fn did_save(&self, params: DidSaveTextDocumentParams) {
        let uri = params.text_document.uri;
        self.state
            .docs
            .touch_dependents(&uri_path(&uri).into_iter().collect::<Vec<_>>(), Some(&uri));
    }

    async fn did_close(&self, params: DidCloseTextDocumentParams) {
        let uri = params.text_document.uri;
        self.state.docs.close(&uri);
        // Models importing it now read it from disk.
        self.state
            .docs
            .touch_dependents(&uri_path(&uri).into_iter().collect::<Vec<_>>(), None);
    }

    async fn did_change_configuration(&self, params: DidChangeConfigurationParams) {
        self.state.set_settings(&params.settings);
    }

    async fn did_change_watched_files(&self, params: DidChangeWatchedFilesParams) {
        let paths: Vec<PathBuf> = params
            .changes
            .iter()
            .filter_map(|c| uri_path(&c.uri))
            .collect();
        self.state.docs.touch_dependents(&paths, None);
    }

    async fn hover(&self, params: HoverParams) -> Result<Option<Hover>> {
        let p = params.text_document_position_params;
        let Some(snap) = self.snapshot(&p.text_document.uri, Need::Final).await else {
            return Ok(None);
        };
        Ok(hover::hover(&snap, p.position, &self.state.settings()))
    }

    async fn inlay_hint(&self, params: InlayHintParams) -> Result<Option<Vec<InlayHint>>> {
        let Some(snap) = self.snapshot(&params.text_document.uri, Need::Final).await else {
            return Ok(None);
        };
        Ok(Some(inlay_hints::inlay_hints(
            &snap,
            params.range,
            &self.state.settings(),
        )))
    }

    async fn goto_definition(
        &self,
        params: GotoDefinitionParams,
    ) -> Result<Option<GotoDefinitionResponse>> {
        let p = params.text_document_position_params;
        let Some(snap) = self.snapshot(&p.text_document.uri, Need::Checked).await else {
            return Ok(None);
        };
        Ok(navigation::definition(&snap, p.position).map(GotoDefinitionResponse::Scalar))
    }

    async fn references(&self, params: ReferenceParams) -> Result<Option<Vec<Location>>> {
        let p = params.text_document_position;
        let include = params.context.include_declaration;
        let Some((snap, key)) = self.symbol_key(&p.text_document.uri, p.position).await else {
            // Sub-network names are not symbols (uses expand before names resolve).
            let snap = self.snapshot(&p.text_document.uri, Need::Checked).await;
            return Ok(snap.and_then(|s| navigation::network_references(&s, p.position, include)));
        };
        let mut out = navigation::references(&snap, &key, include);
        for other in self.related(&snap.uri, Some(key.file.clone())).await {
            for loc in navigation::references(&other, &key, include) {
                if !out.contains(&loc) {
                    out.push(loc);
                }
            }
        }
        Ok(Some(out))
    }

    async fn prepare_rename(
        &self,
        params: TextDocumentPositionParams,
    ) -> Result<Option<PrepareRenameResponse>> {
        let Some(snap) = self
            .snapshot(&params.text_document.uri, Need::Checked)
            .await
        else {
            return Ok(None);
        };
        rename::prepare(&snap, params.position).map_err(Error::invalid_params)
    }

    async fn rename(&self, params: RenameParams) -> Result<Option<WorkspaceEdit>> {
        let p = params.text_document_position;
        let Some((snap, key)) = self.symbol_key(&p.text_document.uri, p.position).await else {
            return Ok(None);
        };
        let others = self.related(&snap.uri, Some(key.file)).await;
        rename::rename(&snap, &others, p.position, &params.new_name).map_err(Error::invalid_params)
    }

    async fn document_symbol(
        &self,
        params: DocumentSymbolParams,
    ) -> Result<Option<DocumentSymbolResponse>> {
        let Some(snap) = self
            .snapshot(&params.text_document.uri, Need::Checked)
            .await
        else {
            return Ok(None);
        };
        Ok(Some(DocumentSymbolResponse::Nested(
            symbols::document_symbols(&snap, &self.state.settings()),
        )))
    }

    async fn symbol(
        &self,
        params: WorkspaceSymbolParams,
    ) -> Result<Option<WorkspaceSymbolResponse>> {
        let mut snaps = self.state.docs.snapshots();
        let closed: Vec<PathBuf> = workspace::heat_files(&self.state.roots())
            .into_iter()
            .filter(|p| !self.state.docs.is_open(p))
            .collect();
        let loader = self.state.docs.loader();
        snaps.extend(
            tokio::task::spawn_blocking(move || workspace::analyze_files(&closed, &loader))
                .await
                .unwrap_or_default(),
        );
        Ok(Some(WorkspaceSymbolResponse::Nested(
            symbols::workspace_symbols(&snaps, &params.query),
        )))
    }

    async fn completion(&self, params: CompletionParams) -> Result<Option<CompletionResponse>> {
        let p = params.text_document_position;
        let Some(snap) = self.snapshot(&p.text_document.uri, Need::Checked).await else {
            return Ok(None);
        };
        Ok(Some(CompletionResponse::Array(completion::completion(
            &snap, p.position,
        ))))
    }

    async fn signature_help(&self, params: SignatureHelpParams) -> Result<Option<SignatureHelp>> {
        let p = params.text_document_position_params;
        let Some(snap) = self.snapshot(&p.text_document.uri, Need::Checked).await else {
            return Ok(None);
        };
        Ok(signature_help::signature_help(&snap, p.position))
    }

    async fn semantic_tokens_full(
        &self,
        params: SemanticTokensParams,
    ) -> Result<Option<SemanticTokensResult>> {
        let Some(snap) = self
            .snapshot(&params.text_document.uri, Need::Checked)
            .await
        else {
            return Ok(None);
        };
        Ok(Some(SemanticTokensResult::Tokens(
            semantic_tokens::semantic_tokens(&snap),
        )))
    }

    async fn formatting(&self, params: DocumentFormattingParams) -> Result<Option<Vec<TextEdit>>> {
        let Some(snap) = self
            .snapshot(&params.text_document.uri, Need::Checked)
            .await
        else {
            return Ok(None);
        };
        Ok(crate::formatting::format_document(&snap))
    }

    async fn code_action(&self, params: CodeActionParams) -> Result<Option<CodeActionResponse>> {
        let Some(snap) = self
            .snapshot(&params.text_document.uri, Need::Checked)
            .await
        else {
            return Ok(None);
        };
        Ok(Some(code_actions::code_actions(&snap, params.range)))
    }
}
