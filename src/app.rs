//! The page: header (views, units, link, print, safety), notices, the open
//! view, and the address kept in step with the design.

use std::time::Duration;

use kneepoint_engine::{Design, UnitSystem};
use leptos::leptos_dom::helpers::TimeoutHandle;
use leptos::prelude::*;

use crate::browser::{self, SESSION_KEY};
use crate::components::charts::Cursor;
use crate::components::faults::FaultFlag;
use crate::components::safety::SafetyPanel;
use crate::design_text::{self, TextError};
use crate::split::{load, split_view, Unloaded};
use crate::state::{AppState, NoticeKind, ViewId};
use crate::url_codec;
use crate::views::circuit::CircuitView;
use crate::views::cycle::CycleView;
use crate::views::field::FieldView;
use leptos::wasm_split::wasm_split;

// The duty-cycle and machine-check views are split out of the main wasm
// and fetched the first time they open (see `crate::split`): the page opens
// on the circuit view with less to download. The service worker stores the
// split files too, so they open offline like the rest.

/// The duty-cycle view, loaded on first use.
#[wasm_split(kneepoint_cycle_view, wasm_split_path = ::leptos::wasm_split, fallible)]
fn cycle_view() -> Result<AnyView, Unloaded> {
    Ok(view! { <CycleView /> }.into_any())
}

/// The machine-check view, loaded on first use.
#[wasm_split(kneepoint_field_view, wasm_split_path = ::leptos::wasm_split, fallible)]
fn field_view() -> Result<AnyView, Unloaded> {
    Ok(view! { <FieldView /> }.into_any())
}

/// What the page opens with.
struct Boot {
    design: Design,
    units: UnitSystem,
    view: Option<ViewId>,
    notice: Option<String>,
}

impl Boot {
    /// The first demo design, with an optional notice.
    fn demo(notice: Option<String>) -> Boot {
        Boot {
            design: Design::default(),
            units: UnitSystem::Metric,
            view: None,
            notice,
        }
    }

    /// What a link (or the session copy of one) holds.
    fn linked(s: url_codec::Shared) -> Boot {
        Boot {
            design: s.design,
            units: s.units,
            view: s.view.as_deref().and_then(ViewId::from_code),
            notice: None,
        }
    }
}

/// The design from the address, else the last session on this device,
/// else the first demo design. A link that cannot be read gives a notice
/// and the demo design. Reading a link loads the design-text module.
async fn boot_from(frag: String, session: Option<String>) -> Boot {
    if !frag.trim().is_empty() {
        return match design_text::decode_link(frag).await {
            Ok(s) => Boot::linked(s),
            Err(e) => Boot::demo(Some(e.message())),
        };
    }
    match session {
        Some(s) => match design_text::decode_link(s).await {
            Ok(s) => Boot::linked(s),
            // A damaged session copy is dropped without a word.
            Err(TextError::Bad(_)) => Boot::demo(None),
            Err(e) => Boot::demo(Some(e.message())),
        },
        None => Boot::demo(None),
    }
}

/// The link fragment of the state now.
async fn fragment_now(st: AppState) -> Result<String, Unloaded> {
    design_text::encode_link(
        st.design.get_untracked(),
        st.units.get_untracked(),
        st.view.get_untracked().code().to_string(),
    )
    .await
}

/// Keeps the address (and the session copy on this device) in step with
/// the design, a quarter second after the last change, without adding
/// history entries. With `at_start` false (a first visit on the demo
/// design) nothing is written until the first change, so the page opens
/// without the design-text module.
fn sync_address(st: AppState, at_start: bool) {
    let pending = StoredValue::new(None::<TimeoutHandle>);
    let last = StoredValue::new(String::new());
    // Encodes finish in the order they were asked for; only the latest
    // one is written.
    let asked = StoredValue::new(0_u64);
    Effect::new(move |prev: Option<()>| {
        // Track every part of the link; encode only when the edits pause.
        st.design.track();
        st.units.track();
        st.view.track();
        if prev.is_none() && !at_start {
            return;
        }
        if let Some(h) = pending.get_value() {
            h.clear();
        }
        let h = set_timeout_with_handle(
            move || {
                asked.update_value(|n| *n += 1);
                let ticket = asked.get_value();
                wasm_bindgen_futures::spawn_local(async move {
                    // Not loaded (offline before the files were stored):
                    // the next change tries again.
                    let Ok(frag) = fragment_now(st).await else {
                        return;
                    };
                    if asked.try_get_value() != Some(ticket) {
                        return;
                    }
                    if last.get_value() != frag {
                        browser::replace_fragment(&frag);
                        let _ = browser::storage_set(SESSION_KEY, &frag);
                        last.set_value(frag);
                    }
                });
            },
            Duration::from_millis(250),
        )
        .ok();
        pending.set_value(h);
    });
    // A link pasted into the address bar of the open page.
    let _ = window_event_listener(leptos::ev::hashchange, move |_| {
        let frag = browser::fragment();
        if frag.trim().is_empty() || Some(&frag) == last.try_get_value().as_ref() {
            return;
        }
        wasm_bindgen_futures::spawn_local(async move {
            if Ok(&frag) == fragment_now(st).await.as_ref() {
                return;
            }
            match design_text::decode_link(frag.clone()).await {
                Ok(s) => {
                    st.units.set(s.units);
                    st.load(s.design);
                    // A pasted link that names a view opens it, as on a fresh load.
                    if let Some(v) = s.view.as_deref().and_then(ViewId::from_code) {
                        st.view.set(v);
                    }
                    last.set_value(frag);
                }
                Err(e) => st.notify(NoticeKind::Problem, e.message()),
            }
        });
    });
}

/// Notices at the top of the page.
#[component]
fn Notices() -> impl IntoView {
    let st = expect_context::<AppState>();
    view! {
        <div class="notices" aria-live="polite">
            {move || {
                st.notices
                    .get()
                    .into_iter()
                    .map(|n| {
                        let id = n.id;
                        view! {
                            <div
                                class="notice"
                                class:problem=n.kind == NoticeKind::Problem
                                role=if n.kind == NoticeKind::Problem { "alert" } else { "status" }
                                data-testid="notice"
                            >
                                <p>{n.text}</p>
                                <button
                                    type="button"
                                    on:click=move |_| st.notices.update(|v| v.retain(|x| x.id != id))
                                >
                                    "Dismiss"
                                </button>
                            </div>
                        }
                    })
                    .collect_view()
            }}
        </div>
    }
}

/// The unit toggle: one choice for every field, chart and result.
#[component]
fn UnitToggle() -> impl IntoView {
    let st = expect_context::<AppState>();
    let button = move |u: UnitSystem, label: &'static str, testid: &'static str| {
        view! {
            <button
                type="button"
                aria-pressed=move || (st.units.get() == u).to_string()
                data-testid=testid
                on:click=move |_| st.units.set(u)
            >
                {label}
            </button>
        }
    };
    view! {
        <div class="toggle" role="group" aria-label="Units">
            {button(UnitSystem::Metric, "Metric", "units-metric")}
            {button(UnitSystem::Us, "US", "units-us")}
        </div>
    }
}

/// Copy-link action, with the link shown for copying by hand.
#[component]
fn ShareLink() -> impl IntoView {
    let st = expect_context::<AppState>();
    let link = RwSignal::new(None::<(String, bool)>);
    let copy = move |_| {
        wasm_bindgen_futures::spawn_local(async move {
            match fragment_now(st).await {
                Ok(frag) => {
                    let url = format!("{}#{frag}", browser::page_address());
                    let copied = browser::copy_to_clipboard(&url);
                    link.set(Some((url, copied)));
                }
                Err(_) => st.notify(NoticeKind::Problem, Unloaded::message("The link")),
            }
        });
    };
    view! {
        <button type="button" on:click=copy data-testid="copy-link">
            "Copy link"
        </button>
        {move || {
            link.get()
                .map(|(url, copied)| {
                    view! {
                        <div class="share" data-testid="share">
                            <label for="share-link">
                                {if copied {
                                    "Link copied. It opens this design exactly:"
                                } else {
                                    "Select and copy this link; it opens this design exactly:"
                                }}
                            </label>
                            <input id="share-link" type="text" readonly prop:value=url />
                            <button type="button" on:click=move |_| link.set(None)>
                                "Done"
                            </button>
                        </div>
                    }
                })
        }}
    }
}

/// The whole page, opening with `b`; `synced` when `b` came from a link
/// or a session (the design-text module is loaded then).
fn app(b: Boot, synced: bool) -> impl IntoView {
    let st = AppState::new(b.design, b.units);
    if let Some(v) = b.view {
        st.view.set(v);
    }
    provide_context(st);
    provide_context(Cursor(RwSignal::new(None)));
    if let Some(n) = b.notice {
        st.notify(NoticeKind::Problem, n);
    }
    sync_address(st, synced);
    browser::register_service_worker();
    let safety_open = RwSignal::new(false);
    let print = move |_| {
        if let Some(w) = web_sys::window() {
            let _ = w.print();
        }
    };
    view! {
        <header class="top">
            <div class="brand">
                <img src="icons/icon.svg" alt="" width="36" height="36" />
                <div>
                    <h1>"Kneepoint"</h1>
                    <p class="tagline">"Two-pump hi-lo circuits: staircase, power, settings"</p>
                </div>
            </div>
            <nav class="views" aria-label="Views">
                {ViewId::ALL
                    .iter()
                    .map(|&v| {
                        view! {
                            <button
                                type="button"
                                aria-current=move || (st.view.get() == v).then_some("page")
                                on:click=move |_| st.view.set(v)
                            >
                                {v.label()}
                            </button>
                        }
                    })
                    .collect_view()}
            </nav>
            <div class="tools">
                <UnitToggle />
                <ShareLink />
                <button type="button" on:click=print>
                    "Print sheet"
                </button>
                <button
                    type="button"
                    class="safety-button"
                    aria-expanded=move || safety_open.get().to_string()
                    aria-controls="safety"
                    data-testid="safety-toggle"
                    on:click=move |_| safety_open.update(|o| *o = !*o)
                >
                    "Safety"
                </button>
            </div>
        </header>
        <Notices />
        <FaultFlag />
        <SafetyPanel open=safety_open />
        <main id="main">
            {move || match st.view.get() {
                ViewId::Circuit => view! { <CircuitView /> }.into_any(),
                ViewId::Field => {
                    split_view(
                        "The machine-check view",
                        "Opening the machine-check view…",
                        load(field_view),
                    )
                        .into_any()
                }
                ViewId::Cycle => {
                    split_view(
                        "The duty-cycle view",
                        "Opening the duty-cycle view…",
                        load(cycle_view),
                    )
                        .into_any()
                }
            }}
        </main>
        <footer class="foot">
            <p>
                "Results are estimates for design and teaching. ISO 4413, local codes and licensed \
                 practice come first. "
                <button type="button" class="link-button" on:click=move |_| safety_open.set(true)>
                    "Read the safety notes"
                </button>
            </p>
        </footer>
    }
}

/// Starts the app (called by the binary): at once on a first visit, else
/// once the link or the last session has been read.
pub fn start() {
    console_error_panic_hook::set_once();
    let frag = browser::fragment();
    let session = if frag.trim().is_empty() {
        browser::storage_get(SESSION_KEY)
    } else {
        None
    };
    if frag.trim().is_empty() && session.is_none() {
        leptos::mount::mount_to_body(move || app(Boot::demo(None), false));
        return;
    }
    wasm_bindgen_futures::spawn_local(async move {
        let b = boot_from(frag, session).await;
        leptos::mount::mount_to_body(move || app(b, true));
    });
}
