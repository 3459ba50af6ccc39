//! Demo designs, designs saved on this device, and design files.

use kneepoint_engine::design::EXAMPLES;
use kneepoint_engine::io;
use leptos::prelude::*;
use wasm_bindgen::JsCast;

use crate::browser::{self, PRESET_PREFIX};
use crate::design_text::{self, TextError};
use crate::presets::{clean_name, file_name, read_entry, stored_text, Entry};
use crate::split::{load, split_view, Unloaded};
use crate::state::{AppState, NoticeKind};
use leptos::wasm_split::wasm_split;

fn key(name: &str) -> String {
    format!("{PRESET_PREFIX}{name}")
}

/// Reads every saved design; damaged ones are listed as such.
pub fn read_all() -> Vec<Entry> {
    browser::storage_keys(PRESET_PREFIX)
        .into_iter()
        .map(|k| {
            let name = k[PRESET_PREFIX.len()..].to_string();
            read_entry(&name, browser::storage_get(&k).as_deref())
        })
        .collect()
}

/// The designs panel: demo designs and design files at once; the designs
/// saved on this device when asked for (their part of the wasm loads then).
#[component]
pub fn Presets() -> impl IntoView {
    let st = expect_context::<AppState>();
    // The name box of the save form, kept here so that opening a demo
    // design or a file names it even before the saved list is open.
    let name = RwSignal::new(st.rest.with_untracked(|d| d.name.clone()));
    let show_saved = RwSignal::new(false);

    let export = move || {
        let d = st.design.get_untracked();
        let n = if d.name.trim().is_empty() {
            "design".to_string()
        } else {
            d.name.clone()
        };
        leptos::task::spawn_local(async move {
            let Ok(text) = design_text::design_file(d).await else {
                return st
                    .notify(NoticeKind::Problem, Unloaded::message("The design file"));
            };
            if let Err(e) = browser::download(&file_name(&n), &text) {
                st.notify(
                    NoticeKind::Problem,
                    format!("Could not export the design file: {e}."),
                );
            }
        });
    };

    let import = move |ev: web_sys::Event| {
        let Some(input) = ev
            .target()
            .and_then(|t| t.dyn_into::<web_sys::HtmlInputElement>().ok())
        else {
            return;
        };
        let Some(file) = input.files().and_then(|f| f.get(0)) else {
            return;
        };
        input.set_value("");
        let fname = file.name();
        if file.size() > io::MAX_FILE_BYTES as f64 {
            st.notify(
                NoticeKind::Problem,
                format!("“{fname}” is too large to be a design file."),
            );
            return;
        }
        let promise = file.text();
        leptos::task::spawn_local(async move {
            let text = wasm_bindgen_futures::JsFuture::from(promise)
                .await
                .ok()
                .and_then(|v| v.as_string());
            let read = match text {
                Some(t) => Some(design_text::read_design_file(t).await),
                None => None,
            };
            match read {
                Some(Ok(d)) => {
                    name.set(d.name.clone());
                    st.load(d);
                    st.notify(NoticeKind::Info, format!("Opened the design file “{fname}”."));
                }
                Some(Err(TextError::Bad(e))) => st.notify(
                    NoticeKind::Problem,
                    format!("“{fname}” is not a design file Kneepoint reads: {e}. Nothing was changed."),
                ),
                Some(Err(e)) => st.notify(NoticeKind::Problem, e.message()),
                None => st.notify(NoticeKind::Problem, format!("“{fname}” could not be read.")),
            }
        });
    };

    view! {
        <section class="panel presets" aria-labelledby="presets-h">
            <h2 id="presets-h">"Designs"</h2>
            <h3>"Demo designs"</h3>
            <ul class="examples">
                {EXAMPLES
                    .iter()
                    .map(|ex| {
                        view! {
                            <li>
                                <button
                                    type="button"
                                    data-testid=format!("example-{}", ex.name)
                                    on:click=move |_| {
                                        let d = (ex.build)();
                                        name.set(d.name.clone());
                                        st.load(d);
                                    }
                                >
                                    {(ex.build)().name}
                                </button>
                                <span class="detail">{ex.title}</span>
                            </li>
                        }
                    })
                    .collect_view()}
            </ul>
            <h3>"Saved on this device"</h3>
            {move || {
                if show_saved.get() {
                    split_view(
                        "The list of saved designs",
                        "Opening the saved designs…",
                        load(move || saved_designs(name)),
                    )
                        .into_any()
                } else {
                    view! {
                        <button
                            type="button"
                            aria-expanded="false"
                            data-testid="saved-show"
                            on:click=move |_| show_saved.set(true)
                        >
                            "Show saved designs"
                        </button>
                    }
                        .into_any()
                }
            }}
            <h3>"Design files"</h3>
            <div class="file-row">
                <button type="button" on:click=move |_| export() data-testid="export">
                    "Export design file"
                </button>
                <label class="button" for="import-file">
                    "Import design file"
                </label>
                <input
                    id="import-file"
                    class="visually-hidden-file"
                    type="file"
                    accept=".json,application/json"
                    on:change=import
                    data-testid="import"
                />
            </div>
        </section>
    }
}

/// The designs saved on this device, loaded the first time they are shown.
#[wasm_split(kneepoint_saved_designs, wasm_split_path = ::leptos::wasm_split, fallible)]
fn saved_designs(name: RwSignal<String>) -> Result<AnyView, Unloaded> {
    Ok(view! { <SavedDesigns name=name /> }.into_any())
}

/// Save by name, and the list of saved designs (open, rename, delete).
#[component]
fn SavedDesigns(
    /// The name box of the save form.
    name: RwSignal<String>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let saved = RwSignal::new(read_all());
    // Damaged entries are reported once, when the list is first shown.
    for e in saved.get_untracked() {
        if let Entry::Broken { name, reason } = e {
            st.notify(
                NoticeKind::Problem,
                format!(
                    "The saved design “{name}” could not be read ({reason}). It was skipped; \
                     every other saved design is available."
                ),
            );
        }
    }
    let refresh = move || saved.set(read_all());
    let confirm_replace = RwSignal::new(false);
    let message = RwSignal::new(None::<String>);

    let save = move || {
        let n = match clean_name(&name.get_untracked()) {
            Ok(n) => n,
            Err(e) => return message.set(Some(e)),
        };
        let exists = saved.with_untracked(|s| s.iter().any(|e| e.name() == n));
        if exists && !confirm_replace.get_untracked() {
            confirm_replace.set(true);
            return message.set(Some(format!(
                "“{n}” is already saved. Press Replace to overwrite it."
            )));
        }
        let text = stored_text(&n, &st.design.get_untracked());
        match browser::storage_set(&key(&n), &text) {
            Ok(()) => {
                st.rest.update(|d| d.name = n.clone());
                message.set(Some(format!("Saved “{n}” on this device.")));
            }
            Err(e) => message.set(Some(format!(
                "Could not save: {e}. Export a design file instead."
            ))),
        }
        confirm_replace.set(false);
        refresh();
    };

    let list = move || {
        saved
            .get()
            .into_iter()
            .map(|e| view! { <SavedRow entry=e on_change=Callback::new(move |()| refresh()) name_box=name /> })
            .collect_view()
    };

    view! {
        <form
            class="save-row"
            on:submit=move |ev| {
                ev.prevent_default();
                save();
            }
        >
            <label for="preset-name">"Name"</label>
            <input
                id="preset-name"
                type="text"
                maxlength="60"
                autocomplete="off"
                prop:value=move || name.get()
                on:input=move |ev| {
                    name.set(event_target_value(&ev));
                    confirm_replace.set(false);
                }
                data-testid="preset-name"
            />
            <button type="submit" data-testid="preset-save">
                {move || if confirm_replace.get() { "Replace" } else { "Save" }}
            </button>
        </form>
        <p class="field-msg" role="status" data-testid="preset-msg">
            {move || message.get()}
        </p>
        <ul class="saved" data-testid="saved-list">
            {list}
        </ul>
        {move || {
            saved
                .with(|s| s.is_empty())
                .then(|| view! { <p class="quiet">"Nothing saved yet."</p> })
        }}
    }
}

/// One saved design: open, rename, delete; or a damaged entry: remove.
#[component]
fn SavedRow(
    /// The entry.
    entry: Entry,
    /// Called after the stored list changed.
    on_change: Callback<()>,
    /// The name box of the save form, set when a design is opened.
    name_box: RwSignal<String>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let n = entry.name().to_string();
    let renaming = RwSignal::new(false);
    let confirm_delete = RwSignal::new(false);
    let new_name = RwSignal::new(n.clone());
    let problem = RwSignal::new(None::<String>);
    match entry {
        Entry::Broken { name, reason } => {
            let k = key(&name);
            view! {
                <li class="saved-row broken" data-testid="saved-broken">
                    <span class="saved-name">{name.clone()}</span>
                    <span class="detail">{format!("could not be read: {reason}")}</span>
                    <button
                        type="button"
                        on:click=move |_| {
                            browser::storage_remove(&k);
                            on_change.run(());
                        }
                    >
                        "Remove damaged entry"
                    </button>
                </li>
            }
            .into_any()
        }
        Entry::Design { name, design } => {
            let design = *design;
            let (n1, n2, n3) = (name.clone(), name.clone(), name.clone());
            let rename = move || {
                let to = match clean_name(&new_name.get_untracked()) {
                    Ok(t) => t,
                    Err(e) => return problem.set(Some(e)),
                };
                if to == n2 {
                    renaming.set(false);
                    return;
                }
                if browser::storage_get(&key(&to)).is_some() {
                    return problem.set(Some(format!(
                        "“{to}” is already saved; choose another name."
                    )));
                }
                let Some(text) = browser::storage_get(&key(&n2)) else {
                    return problem
                        .set(Some("This entry is gone; reload the page.".into()));
                };
                let text = io::parse_design(&text)
                    .map(|d| stored_text(&to, &d))
                    .unwrap_or(text);
                match browser::storage_set(&key(&to), &text) {
                    Ok(()) => {
                        browser::storage_remove(&key(&n2));
                        renaming.set(false);
                        on_change.run(());
                    }
                    Err(e) => problem.set(Some(format!("Could not rename: {e}."))),
                }
            };
            view! {
                <li class="saved-row" data-testid="saved-row" data-name=name.clone()>
                    <span class="saved-name">{name.clone()}</span>
                    <span class="row-actions">
                        <button
                            type="button"
                            data-testid="saved-open"
                            on:click=move |_| {
                                name_box.set(n1.clone());
                                st.load(design.clone());
                            }
                        >
                            "Open"
                        </button>
                        <button
                            type="button"
                            aria-expanded=move || renaming.get().to_string()
                            on:click=move |_| renaming.update(|r| *r = !*r)
                        >
                            "Rename"
                        </button>
                        <button
                            type="button"
                            data-testid="saved-delete"
                            on:click=move |_| {
                                if confirm_delete.get_untracked() {
                                    browser::storage_remove(&key(&n3));
                                    on_change.run(());
                                } else {
                                    confirm_delete.set(true);
                                }
                            }
                        >
                            {move || if confirm_delete.get() { "Confirm delete" } else { "Delete" }}
                        </button>
                    </span>
                    {move || {
                        renaming
                            .get()
                            .then(|| {
                                let rename = rename.clone();
                                view! {
                                    <form
                                        class="rename-row"
                                        on:submit=move |ev| {
                                            ev.prevent_default();
                                            rename();
                                        }
                                    >
                                        <label>
                                            "New name "
                                            <input
                                                type="text"
                                                maxlength="60"
                                                prop:value=move || new_name.get()
                                                on:input=move |ev| new_name.set(event_target_value(&ev))
                                            />
                                        </label>
                                        <button type="submit">"Rename"</button>
                                    </form>
                                }
                            })
                    }}
                    <span class="field-msg">{move || problem.get()}</span>
                </li>
            }
            .into_any()
        }
    }
}
