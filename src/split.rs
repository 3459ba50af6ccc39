//! Split points: the parts of the app that load the first time they are
//! needed. Each is a function marked
//! `#[wasm_split(unique_name, wasm_split_path = ::leptos::wasm_split, fallible)]`
//! (scripts/build-wasm.sh cuts the wasm there); the name must be unique in
//! the crate, as it names the module's symbols. Natively each is a plain
//! async call.
//!
//! Loading can fail: the network dropped before the service worker stored
//! the files, or a new version of the site replaced them while this page
//! was open. Every split function then returns [`Unloaded`] instead of
//! panicking, and the page says what to do; a later call tries again.

use std::future::Future;
use std::pin::Pin;
use std::sync::Arc;

use leptos::prelude::*;

/// A split module could not be loaded.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Unloaded;

impl From<leptos::wasm_split::SplitLoaderError> for Unloaded {
    fn from(_: leptos::wasm_split::SplitLoaderError) -> Self {
        Unloaded
    }
}

impl Unloaded {
    /// What to tell the user about `what` (a noun phrase).
    pub fn message(what: &str) -> String {
        format!(
            "{what} could not be loaded: the connection dropped, or Kneepoint was updated \
             while this page was open. Reload the page with the network on; nothing you \
             entered is lost."
        )
    }
}

/// Loads a split part of the page (boxed, so [`split_view`] is one function
/// for all of them, not one copy per part).
pub type SplitLoad = Arc<
    dyn Fn() -> Pin<Box<dyn Future<Output = Result<AnyView, Unloaded>> + Send>>
        + Send
        + Sync,
>;

/// `f` as a [`SplitLoad`].
pub fn load<F, Fut>(f: F) -> SplitLoad
where
    F: Fn() -> Fut + Send + Sync + 'static,
    Fut: Future<Output = Result<AnyView, Unloaded>> + Send + 'static,
{
    Arc::new(move || Box::pin(f()))
}

/// A split part of the page: `load` it, showing `waiting` meanwhile; if it
/// cannot be loaded, say so (`what` names it) with a button that tries
/// again.
pub fn split_view(what: &'static str, waiting: &'static str, load: SplitLoad) -> AnyView {
    let attempt = RwSignal::new(0_u32);
    view! {
        <Suspense fallback=move || {
            view! {
                <p class="loading quiet" role="status" data-testid="split-loading">
                    {waiting}
                </p>
            }
        }>
            {move || {
                attempt.track();
                let next = load();
                Suspend::new(async move {
                    match next.await {
                        Ok(v) => v,
                        Err(Unloaded) => {
                            view! {
                                <div class="notice problem" role="alert" data-testid="unloaded">
                                    <p>{Unloaded::message(what)}</p>
                                    <button
                                        type="button"
                                        on:click=move |_| attempt.update(|n| *n += 1)
                                    >
                                        "Try again"
                                    </button>
                                </div>
                            }
                                .into_any()
                        }
                    }
                })
            }}
        </Suspense>
    }
    .into_any()
}
