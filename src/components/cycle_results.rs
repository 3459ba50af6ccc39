//! Whole-cycle figures, the targets (met or missed, with the smallest
//! single change for a miss), and the cycle's warnings with what to do.

use kneepoint_engine::cycle::{RequirementKind, Requirements};
use kneepoint_engine::fields::{self, FIELDS};
use kneepoint_engine::units::format;
use kneepoint_engine::Quantity;
use leptos::prelude::*;

use crate::components::cycle_input::{input_id, CycleNumber};
use crate::components::field::field_id;
use crate::components::motor_card::{card_row, percent};
use crate::state::{AppState, CycleState, ViewId};

/// Moves the focus to the input of a design path: on this view when it is
/// here, else on the Circuit view. Folded groups around it are opened.
pub fn focus_path(st: AppState, path: &'static str) {
    let find = move || {
        let doc = web_sys::window()?.document()?;
        doc.get_element_by_id(&field_id(path))
            .or_else(|| doc.get_element_by_id(&input_id(path)))
    };
    let focus = move |el: web_sys::Element| {
        let mut up = el.parent_element();
        while let Some(p) = up {
            if p.tag_name().eq_ignore_ascii_case("details") {
                let _ = p.set_attribute("open", "");
            }
            up = p.parent_element();
        }
        if let Some(h) = wasm_bindgen::JsCast::dyn_ref::<web_sys::HtmlElement>(&el) {
            let _ = h.focus();
        }
    };
    if let Some(el) = find() {
        focus(el);
    } else if fields::spec(path).is_some() || path == "drive.motor_rating_w" {
        st.view.set(ViewId::Circuit);
        request_animation_frame(move || {
            if let Some(el) = find() {
                focus(el);
            }
        });
    }
}

/// A label for the design field a warning names.
fn path_label(path: &str) -> &'static str {
    if let Some(s) = fields::spec(path) {
        return s.label;
    }
    match path {
        "cycle.segments" => "the load profile",
        "cycle.motor.chosen_rating_w" => "the motor to check",
        "cycle.reservoir.wetted_area_m2" => "the oil-wetted wall area",
        "drive.motor_rating_w" => "Installed motor rating",
        _ => "",
    }
}

fn go_to(st: AppState, path: &'static str) -> impl IntoView {
    let label = path_label(path);
    let target: Option<&'static str> = match path {
        "cycle.segments" => None,
        "cycle.motor.chosen_rating_w" => Some("cycle.motor.chosen_rating_w"),
        p => Some(p),
    };
    (!label.is_empty() && target.is_some()).then(|| {
        view! {
            <button
                type="button"
                class="link-button"
                on:click=move |_| {
                    if path == "cycle.motor.chosen_rating_w" {
                        if let Some(el) = web_sys::window()
                            .and_then(|w| w.document())
                            .and_then(|d| d.get_element_by_id("c-motor-choice"))
                        {
                            if let Some(h) = wasm_bindgen::JsCast::dyn_ref::<web_sys::HtmlElement>(&el) {
                                let _ = h.focus();
                            }
                        }
                    } else {
                        focus_path(st, path);
                    }
                }
            >
                {format!("Go to {label}")}
            </button>
        }
    })
}

/// Whole-cycle figures.
#[component]
pub fn CycleTotals() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    move || {
        let u = st.units.get();
        cy.cycle_shown.with(|r| {
            let r = r.as_ref()?;
            let t = &r.totals;
            let e = |j: f64| format(Quantity::Energy, u, j);
            let derived = r.profile_derived.then(|| {
                view! { <p class="quiet">"Profile derived from the loads (no profile of its own yet)."</p> }
            });
            Some(view! {
                <section class="panel card totals-card" aria-labelledby="totals-h">
                    <h2 id="totals-h">"Whole cycle"</h2>
                    {derived}
                    <dl class="results" data-testid="cycle-totals" data-cycle-time-s=t.cycle_time_s.to_string()>
                        {card_row(
                            "Cycle time",
                            format!("{} s", crate::fmt::fixed(t.cycle_time_s, 2)),
                            Some(format!("{} cycles per hour", crate::fmt::fixed(t.cycles_per_hour, 0))),
                            "total-time",
                        )}
                        {card_row(
                            "Shaft power",
                            format!(
                                "{} peak, {} RMS",
                                format(Quantity::Power, u, t.peak_power_w),
                                format(Quantity::Power, u, t.rms_power_w)
                            ),
                            Some(format!("Mean {}", format(Quantity::Power, u, t.mean_power_w))),
                            "total-power",
                        )}
                        {card_row(
                            "Energy per cycle",
                            format!("{} in at the shaft", e(t.energy_in_j)),
                            Some(format!(
                                "{} of work on the load, {} to heat",
                                e(t.work_out_j),
                                e(t.heat.total())
                            )),
                            "total-energy",
                        )}
                        {card_row(
                            "Highest pressure",
                            format(Quantity::Pressure, u, t.pressure_max_pa),
                            (t.stored_end_j > 0.0)
                                .then(|| format!("{} still held in compressed oil at the end", e(t.stored_end_j))),
                            "total-pressure",
                        )}
                    </dl>
                </section>
            })
        })
    }
}

fn requirement_words(k: RequirementKind) -> (&'static str, Quantity, bool) {
    match k {
        RequirementKind::ApproachSpeed => {
            ("Mean approach speed", Quantity::Velocity, true)
        }
        RequirementKind::PressingSpeed => {
            ("Mean pressing speed", Quantity::Velocity, true)
        }
        RequirementKind::CycleTime => ("Cycle time", Quantity::Time, false),
        // Kinds added to the engine later read as plain numbers.
        #[allow(unreachable_patterns)]
        _ => ("Target", Quantity::Ratio, true),
    }
}

fn target_input(
    st: AppState,
    label: &'static str,
    q: Quantity,
    key: &'static str,
    get: fn(&Requirements) -> Option<f64>,
    set: fn(&mut Requirements, Option<f64>),
) -> impl IntoView {
    let value = Signal::derive(move || st.rest.with(|d| get(&d.cycle.requirements)));
    let on_set = Callback::new(move |v: Option<f64>| {
        st.rest.update(|d| set(&mut d.cycle.requirements, v));
    });
    view! {
        <CycleNumber
            label=label
            quantity=q
            path=format!("cycle.requirements.{key}")
            value=value
            on_set=on_set
            blank="no target"
        />
    }
}

/// The targets: inputs, met or missed with margin, and the fix for a miss.
#[component]
pub fn TargetsCard() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    let results = move || {
        let u = st.units.get();
        cy.cycle_shown.with(|r| {
            let r = r.as_ref()?;
            if r.requirements.is_empty() {
                return Some(
                    view! { <p class="quiet">"No targets set: enter a speed or a cycle time."</p> }
                        .into_any(),
                );
            }
            let rows = r
                .requirements
                .iter()
                .map(|q| {
                    let (name, qty, at_least) = requirement_words(q.kind);
                    let need = format!(
                        "{} {}",
                        if at_least { "at least" } else { "at most" },
                        format(qty, u, q.required)
                    );
                    let got = q.achieved.map_or_else(
                        || "no such segment in the profile".to_string(),
                        |a| format(qty, u, a),
                    );
                    let margin = q
                        .margin
                        .map(|m| format!(", margin {}{}", if m >= 0.0 { "+" } else { "" }, percent(m)))
                        .unwrap_or_default();
                    let fix = q.fix.map(|c| {
                        let path = c.field();
                        let index = FIELDS.iter().position(|s| s.path == path);
                        let to = match c {
                            kneepoint_engine::cycle::Change::SmallPumpDisplacement { to_m3, .. }
                            | kneepoint_engine::cycle::Change::LargePumpDisplacement { to_m3, .. } => Some(to_m3),
                            #[allow(unreachable_patterns)]
                            _ => None,
                        };
                        let apply = index.zip(to).map(|(i, to)| {
                            view! {
                                <button
                                    type="button"
                                    data-testid="apply-fix"
                                    on:click=move |_| st.values[i].set(to)
                                >
                                    "Apply this change"
                                </button>
                            }
                        });
                        view! {
                            <p class="fix">{c.message(u)} " " {apply}</p>
                        }
                    });
                    let no_fix = (!q.met && q.fix.is_none()).then(|| {
                        view! {
                            <p class="fix">
                                "No single pump change up to 16 times its size meets it: look at the \
                                 load, the settings or the profile."
                            </p>
                        }
                    });
                    view! {
                        <li
                            class:ok=q.met
                            class:fail=!q.met
                            data-testid=format!("target-{}", kind_code(q.kind))
                            data-met=q.met.to_string()
                        >
                            <span class="badge">{if q.met { "Met" } else { "Missed" }}</span>
                            <span>
                                <strong>{name}</strong>
                                {format!(": {got}, needed {need}{margin}")}
                                {fix}
                                {no_fix}
                            </span>
                        </li>
                    }
                })
                .collect_view();
            Some(view! { <ul class="checks">{rows}</ul> }.into_any())
        })
    };
    view! {
        <section class="panel card targets-card" aria-labelledby="targets-h" data-testid="targets-card">
            <h2 id="targets-h">"Targets"</h2>
            {results}
            <details class="advanced">
                <summary>"Set targets (3)"</summary>
                {target_input(
                    st,
                    "Mean approach speed, at least",
                    Quantity::Velocity,
                    "approach_speed_ms",
                    |r| r.approach_speed_ms,
                    |r, v| r.approach_speed_ms = v,
                )}
                {target_input(
                    st,
                    "Mean pressing speed, at least",
                    Quantity::Velocity,
                    "pressing_speed_ms",
                    |r| r.pressing_speed_ms,
                    |r, v| r.pressing_speed_ms = v,
                )}
                {target_input(
                    st,
                    "Cycle time, at most",
                    Quantity::Time,
                    "cycle_time_s",
                    |r| r.cycle_time_s,
                    |r, v| r.cycle_time_s = v,
                )}
            </details>
        </section>
    }
}

fn kind_code(k: RequirementKind) -> &'static str {
    match k {
        RequirementKind::ApproachSpeed => "approach_speed",
        RequirementKind::PressingSpeed => "pressing_speed",
        RequirementKind::CycleTime => "cycle_time",
        #[allow(unreachable_patterns)]
        _ => "other",
    }
}

/// The cycle's warnings, each with what to do and where.
#[component]
pub fn CycleWarnings() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    let list = move || {
        let u = st.units.get();
        cy.cycle_shown.with(|r| {
            let r = r.as_ref()?;
            let n = r.warnings.len();
            let items = r
                .warnings
                .iter()
                .map(|w| {
                    let seg = w.segment.map(|i| {
                        let name = r.segments.get(i).map_or("", |s| s.label);
                        format!("Segment {} ({name}): ", i + 1)
                    });
                    view! { <li>{seg} {w.message(u)} " " {go_to(st, w.field)}</li> }
                })
                .collect_view();
            Some(view! {
                <h2 id="cycle-warn-h">{format!("Cycle warnings ({n})")}</h2>
                {(n == 0).then(|| view! { <p class="quiet">"None for this cycle."</p> })}
                <ul class="warnings" data-testid="cycle-warnings">{items}</ul>
            })
        })
    };
    view! {
        <section class="panel card warnings-card" aria-labelledby="cycle-warn-h">
            {list}
        </section>
    }
}
