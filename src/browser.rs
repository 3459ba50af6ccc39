//! The few places that touch the browser: the address, local storage, the
//! clipboard, file download and the service worker. Every call that can
//! fail returns a `Result` or an `Option`; nothing here panics.

use gloo_storage::{LocalStorage, Storage};
use wasm_bindgen::{JsCast, JsValue};

/// The page's fragment without `#` (empty when there is none).
pub fn fragment() -> String {
    web_sys::window()
        .and_then(|w| w.location().hash().ok())
        .map(|h| h.trim_start_matches('#').to_string())
        .unwrap_or_default()
}

/// The page address without its fragment.
pub fn page_address() -> String {
    web_sys::window()
        .and_then(|w| w.location().href().ok())
        .map(|h| h.split('#').next().unwrap_or_default().to_string())
        .unwrap_or_default()
}

/// Replaces the fragment without adding a history entry.
pub fn replace_fragment(fragment: &str) {
    if let Some(w) = web_sys::window() {
        if let Ok(h) = w.history() {
            let url = format!("#{fragment}");
            let _ = h.replace_state_with_url(&JsValue::NULL, "", Some(&url));
        }
    }
}

/// Prefix of every saved design's key in local storage.
pub const PRESET_PREFIX: &str = "kneepoint.preset.";
/// Key of the last session's link, restored when a page opens without one.
pub const SESSION_KEY: &str = "kneepoint.session";

/// Every key in local storage that starts with `prefix`.
pub fn storage_keys(prefix: &str) -> Vec<String> {
    let s = LocalStorage::raw();
    let n = s.length().unwrap_or(0);
    let mut keys: Vec<String> = (0..n)
        .filter_map(|i| s.key(i).ok().flatten())
        .filter(|k| k.starts_with(prefix))
        .collect();
    keys.sort();
    keys
}

/// The raw text stored under `key`.
pub fn storage_get(key: &str) -> Option<String> {
    LocalStorage::raw().get_item(key).ok().flatten()
}

/// Stores raw text under `key`.
///
/// # Errors
/// The browser's reason (storage full, or disabled).
pub fn storage_set(key: &str, value: &str) -> Result<(), String> {
    LocalStorage::raw()
        .set_item(key, value)
        .map_err(|e| js_text(&e, "storage is full or disabled"))
}

/// Removes `key`.
pub fn storage_remove(key: &str) {
    LocalStorage::delete(key);
}

fn js_text(e: &JsValue, fallback: &str) -> String {
    e.as_string()
        .or_else(|| {
            e.dyn_ref::<js_sys::Error>()
                .map(|e| String::from(e.message()))
        })
        .unwrap_or_else(|| fallback.to_string())
}

/// Copies `text` to the clipboard; `false` when the browser refuses (e.g.
/// a page served over plain http to another machine).
pub fn copy_to_clipboard(text: &str) -> bool {
    let Some(w) = web_sys::window() else {
        return false;
    };
    if !w.is_secure_context() {
        return false;
    }
    // The promise settles later; a refusal is harmless because the link
    // also stays visible and selectable on the page.
    settle(w.navigator().clipboard().write_text(text));
    true
}

/// Offers `text` as a file download named `name`.
///
/// # Errors
/// The browser's reason.
pub fn download(name: &str, text: &str) -> Result<(), String> {
    let fail = |e: JsValue| js_text(&e, "the browser refused the download");
    let w = web_sys::window().ok_or("no window")?;
    let doc = w.document().ok_or("no document")?;
    let parts = js_sys::Array::of1(&JsValue::from_str(text));
    let opts = web_sys::BlobPropertyBag::new();
    opts.set_type("application/json");
    let blob =
        web_sys::Blob::new_with_str_sequence_and_options(&parts, &opts).map_err(fail)?;
    let url = web_sys::Url::create_object_url_with_blob(&blob).map_err(fail)?;
    let a: web_sys::HtmlAnchorElement = doc
        .create_element("a")
        .map_err(fail)?
        .dyn_into()
        .map_err(|_| "no anchor".to_string())?;
    a.set_href(&url);
    a.set_download(name);
    a.click();
    // Revoke later: revoking at once can cancel the download.
    leptos::prelude::set_timeout(
        move || {
            let _ = web_sys::Url::revoke_object_url(&url);
        },
        std::time::Duration::from_secs(5),
    );
    Ok(())
}

/// Registers the service worker that keeps the site usable offline. It
/// only runs on https or localhost; elsewhere this quietly does nothing.
pub fn register_service_worker() {
    if let Some(w) = web_sys::window() {
        if !w.is_secure_context() {
            return;
        }
        settle(w.navigator().service_worker().register("./sw.js"));
    }
}

/// Waits for a promise and drops its outcome, so that a refusal does not
/// surface as an unhandled rejection in the console.
fn settle(p: js_sys::Promise) {
    leptos::task::spawn_local(async move {
        let _ = wasm_bindgen_futures::JsFuture::from(p).await;
    });
}

/// Milliseconds since the page started (for the benchmark hook).
pub fn now_ms() -> f64 {
    web_sys::window()
        .and_then(|w| w.performance())
        .map_or(0.0, |p| p.now())
}
