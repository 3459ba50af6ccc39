//! The heat card: mean heat into the oil and where it comes from, the
//! reservoir's steady rise and time constant, the cooler needed, and the
//! oil-temperature warnings (brief §7).

use kneepoint_engine::cycle::CycleWarningKind;
use kneepoint_engine::units::format;
use kneepoint_engine::Quantity;
use leptos::prelude::*;

use crate::components::cycle_input::CycleNumber;
use crate::components::motor_card::{card_row, percent};
use crate::state::{AppState, CycleState};

/// A reservoir input: `get` reads it from the design, `set` writes it.
fn reservoir_input(
    st: AppState,
    label: &'static str,
    q: Quantity,
    key: &'static str,
    blank: Option<&'static str>,
    get: fn(&kneepoint_engine::cycle::Reservoir) -> Option<f64>,
    set: fn(&mut kneepoint_engine::cycle::Reservoir, Option<f64>),
) -> impl IntoView {
    let value = Signal::derive(move || st.rest.with(|d| get(&d.cycle.reservoir)));
    let on_set = Callback::new(move |v: Option<f64>| {
        if v.is_some() || blank.is_some() {
            st.rest.update(|d| set(&mut d.cycle.reservoir, v));
        }
    });
    match blank {
        Some(b) => view! {
            <CycleNumber
                label=label
                quantity=q
                path=format!("cycle.reservoir.{key}")
                value=value
                on_set=on_set
                blank=b
            />
        }
        .into_any(),
        None => view! {
            <CycleNumber label=label quantity=q path=format!("cycle.reservoir.{key}") value=value on_set=on_set />
        }
        .into_any(),
    }
}

fn reservoir_inputs(st: AppState) -> impl IntoView {
    view! {
        <details class="advanced" open=true>
            <summary>"Reservoir (5)"</summary>
            {reservoir_input(
                st,
                "Oil in the tank",
                Quantity::Volume,
                "oil_volume_m3",
                Some("3 min of pump flow"),
                |r| r.oil_volume_m3,
                |r, v| r.oil_volume_m3 = v,
            )}
            {reservoir_input(
                st,
                "Oil-wetted wall area",
                Quantity::Area,
                "wetted_area_m2",
                Some("estimate from the volume"),
                |r| r.wetted_area_m2,
                |r, v| r.wetted_area_m2 = v,
            )}
            {reservoir_input(
                st,
                "Wall heat transfer U",
                Quantity::HeatTransfer,
                "heat_transfer_w_m2k",
                None,
                |r| Some(r.heat_transfer_w_m2k),
                |r, v| r.heat_transfer_w_m2k = v.unwrap_or(r.heat_transfer_w_m2k),
            )}
            {reservoir_input(
                st,
                "Ambient air",
                Quantity::Temperature,
                "ambient_c",
                None,
                |r| Some(r.ambient_c),
                |r, v| r.ambient_c = v.unwrap_or(r.ambient_c),
            )}
            {reservoir_input(
                st,
                "Highest oil temperature allowed",
                Quantity::Temperature,
                "max_oil_c",
                None,
                |r| Some(r.max_oil_c),
                |r, v| r.max_oil_c = v.unwrap_or(r.max_oil_c),
            )}
        </details>
    }
}

/// The heat card.
#[component]
pub fn HeatCard() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    let body = move || {
        let u = st.units.get();
        cy.cycle_shown.with(|r| {
            let r = r.as_ref()?;
            let h = &r.heat;
            let t = &r.totals;
            let pw = |w: f64| format(Quantity::Power, u, w);
            let temp = |c: f64| format(Quantity::Temperature, u, c);
            let per = |j: f64| if t.cycle_time_s > 0.0 { j / t.cycle_time_s } else { 0.0 };
            let total = t.heat.total();
            let sources = [
                ("Relief valve", t.heat.relief_j),
                ("Unloaded large pump", t.heat.unloaded_j),
                ("Valves, lines, released oil", t.heat.valves_lines_j),
                ("Pump friction and leakage", t.heat.pumps_j),
            ];
            let bars = sources
                .into_iter()
                .map(|(name, j)| {
                    let share = if total > 0.0 { j / total } else { 0.0 };
                    view! {
                        <li class="source" data-share=share.to_string()>
                            <span class="source-name">{name}</span>
                            <svg class="source-bar" viewBox="0 0 100 8" preserveAspectRatio="none" aria-hidden="true">
                                <rect class="source-track" width="100" height="8" />
                                <rect class="source-fill" width=format!("{:.1}", 100.0 * share) height="8" />
                            </svg>
                            <span class="source-value">
                                {format!(
                                    "{} ({}, {} per cycle)",
                                    pw(per(j)),
                                    percent(share),
                                    format(Quantity::Energy, u, j)
                                )}
                            </span>
                        </li>
                    }
                })
                .collect_view();
            let est = |e: bool| if e { " (estimated)" } else { " (entered)" };
            let hot = r
                .warnings
                .iter()
                .filter(|w| {
                    matches!(
                        w.kind,
                        CycleWarningKind::OilTemperature { .. } | CycleWarningKind::CoolerNeeded { .. }
                    )
                })
                .map(|w| view! { <li>{w.message(u)}</li> })
                .collect_view();
            let over = h.steady_oil_c > h.max_oil_c;
            Some(view! {
                <dl class="results" data-mean-heat-w=h.mean_heat_w.to_string() data-testid="heat-figures">
                    {card_row(
                        "Mean heat into the oil",
                        pw(h.mean_heat_w),
                        Some(format!(
                            "Shaft energy less the work on the load, over {} s",
                            crate::fmt::fixed(t.cycle_time_s, 2)
                        )),
                        "heat-mean",
                    )}
                </dl>
                <ul class="sources" aria-label="Heat by source">{bars}</ul>
                <dl class="results">
                    {card_row(
                        "Steady oil temperature, no cooler",
                        temp(h.steady_oil_c),
                        Some(format!(
                            "{} above ambient {}; allowed up to {}",
                            format(Quantity::TemperatureRise, u, h.steady_rise_k),
                            temp(h.ambient_c),
                            temp(h.max_oil_c)
                        )),
                        "heat-steady",
                    )}
                    {card_row(
                        "Time constant of the tank",
                        format!(
                            "{} s ({} min)",
                            crate::fmt::fixed(h.time_constant_s, 0),
                            crate::fmt::fixed(h.time_constant_s / 60.0, 0)
                        ),
                        Some("About two-thirds of the rise after one time constant, nearly all after three".into()),
                        "heat-tau",
                    )}
                    {card_row(
                        "Cooler needed",
                        if h.cooler_w > 0.0 { pw(h.cooler_w) } else { "none".into() },
                        Some(if over {
                            format!(
                                "Or a wetted area of {} without a cooler",
                                format(Quantity::Area, u, h.area_needed_m2)
                            )
                        } else {
                            "The tank walls shed the heat within the allowed temperature".into()
                        }),
                        "heat-cooler",
                    )}
                    {card_row(
                        "Tank used",
                        format!(
                            "{}{}, {}{} wetted",
                            format(Quantity::Volume, u, h.oil_volume_m3),
                            est(h.oil_volume_estimated),
                            format(Quantity::Area, u, h.wetted_area_m2),
                            est(h.wetted_area_estimated)
                        ),
                        Some(format!(
                            "U = {}; oil heats {} crossing the relief at full flow",
                            format(Quantity::HeatTransfer, u, h.heat_transfer_w_m2k),
                            format(Quantity::TemperatureRise, u, h.relief_rise_k)
                        )),
                        "heat-tank",
                    )}
                </dl>
                <ul class="warnings" data-testid="heat-warnings">{hot}</ul>
            })
        })
    };
    view! {
        <section class="panel card heat-card" aria-labelledby="heat-h" data-testid="heat-card">
            <h2 id="heat-h">"Oil heat"</h2>
            {body}
            {reservoir_inputs(st)}
        </section>
    }
}
