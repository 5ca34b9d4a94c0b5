//! The server in this process, for the server crate's own tests (the root crate's tests run
//! the server binary instead and have no tokio of their own).

use super::client::RpcClient;

/// The server on one end of an in-process socket pair, on its own two-thread runtime (tokio's
/// default 2 MB worker stacks, smaller than the server binary's), and a client on the other.
pub fn start() -> RpcClient {
    let (ours, theirs) = std::os::unix::net::UnixStream::pair().expect("socket pair");
    std::thread::spawn(move || {
        let rt = tokio::runtime::Builder::new_multi_thread()
            .worker_threads(2)
            .enable_all()
            .build()
            .expect("runtime");
        rt.block_on(async move {
            theirs.set_nonblocking(true).expect("nonblocking");
            let stream = tokio::net::UnixStream::from_std(theirs).expect("tokio stream");
            let (r, w) = stream.into_split();
            caloris_lsp::serve(r, w).await;
        });
    });
    let reader = ours.try_clone().expect("clone");
    RpcClient::new(Box::new(reader), Box::new(ours))
}
