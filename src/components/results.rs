//! Results, the settings check, warnings and input problems.

use kneepoint_engine::fields;
use leptos::prelude::*;

use crate::components::field::field_id;
use crate::state::AppState;
use crate::summary::{checks, rows};

fn field_label(path: &str) -> &'static str {
    fields::spec(path).map_or(
        match path {
            "drive.motor_rating_w" => "Installed motor rating",
            _ => "a design value",
        },
        |s| s.label,
    )
}

/// Moves focus to the input of `path` (and opens its folded group).
fn focus_field(path: &str) {
    let Some(doc) = web_sys::window().and_then(|w| w.document()) else {
        return;
    };
    let id = if path == "drive.motor_rating_w" {
        "f-motor".to_string()
    } else {
        field_id(path)
    };
    if let Some(el) = doc.get_element_by_id(&id) {
        if let Ok(Some(d)) = el.closest("details") {
            let _ = d.set_attribute("open", "");
        }
        if let Some(h) = wasm_bindgen::JsCast::dyn_ref::<web_sys::HtmlElement>(&el) {
            let _ = h.focus();
        }
    }
}

/// A button that names a field and takes the focus there (none for a
/// design value that has no input on this view).
fn go_to(path: &'static str) -> impl IntoView {
    let has_input = fields::spec(path).is_some() || path == "drive.motor_rating_w";
    has_input.then(|| {
        view! {
            <button type="button" class="link-button" on:click=move |_| focus_field(path)>
                {format!("Go to {}", field_label(path))}
            </button>
        }
    })
}

/// The results panel.
#[component]
pub fn Results() -> impl IntoView {
    let st = expect_context::<AppState>();
    let problems = move || {
        let u = st.units.get();
        st.outcome.with(|o| match o {
            Ok(_) => None,
            Err(e) => Some(
                e.0.iter()
                    .map(|e| {
                        (
                            e.field,
                            format!("{}: {}", field_label(e.field), e.message(u)),
                        )
                    })
                    .collect::<Vec<_>>(),
            ),
        })
    };
    let stale = move || {
        problems().map(|list| {
            view! {
                <div class="stale" role="alert" data-testid="stale">
                    <p>
                        <strong>"These results are for the last valid design."</strong>
                        " Fix the marked inputs to update them:"
                    </p>
                    <ul>
                        {list
                            .into_iter()
                            .map(|(f, m)| view! { <li>{m} " " {go_to(f)}</li> })
                            .collect_view()}
                    </ul>
                </div>
            }
        })
    };
    let body = move || {
        let u = st.units.get();
        st.shown.with(|g| {
            g.as_ref().map(|g| {
                let rows = rows(&g.design, &g.report, u);
                let checks = checks(&g.design, &g.report, u);
                let warnings: Vec<(&'static str, String)> =
                    g.report.warnings.iter().map(|w| (w.field, w.message(u))).collect();
                let n = warnings.len();
                view! {
                    <dl class="results" data-testid="results">
                        {rows
                            .into_iter()
                            .map(|r| {
                                view! {
                                    <div class="result" data-testid=format!("result-{}", r.key)>
                                        <dt>{r.label}</dt>
                                        <dd>
                                            <span class="value">{r.value}</span>
                                            <span class="detail">{r.detail}</span>
                                        </dd>
                                    </div>
                                }
                            })
                            .collect_view()}
                    </dl>
                    <h3>"Settings check"</h3>
                    <ul class="checks" data-testid="checks">
                        {checks
                            .into_iter()
                            .map(|c| {
                                view! {
                                    <li class:ok=c.ok class:fail=!c.ok data-testid=format!("check-{}", c.key)>
                                        <span class="badge">{if c.ok { "OK" } else { "Check" }}</span>
                                        <span>
                                            <strong>{c.label}</strong>
                                            ": "
                                            {c.detail}
                                        </span>
                                    </li>
                                }
                            })
                            .collect_view()}
                    </ul>
                    <h3>{format!("Warnings ({n})")}</h3>
                    {(n == 0).then(|| view! { <p class="quiet">"None for this design."</p> })}
                    <ul class="warnings" data-testid="warnings">
                        {warnings
                            .into_iter()
                            .map(|(f, m)| view! { <li>{m} " " {go_to(f)}</li> })
                            .collect_view()}
                    </ul>
                }
            })
        })
    };
    view! {
        <section class="panel results-panel" aria-labelledby="results-h">
            <h2 id="results-h">"Results"</h2>
            {stale}
            {body}
        </section>
    }
}
