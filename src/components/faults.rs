//! The fault simulator (for trainers): inject worn pumps, a leaking check
//! valve, a check valve stuck open or shut, a mis-set or stuck unloading
//! valve, a relief set low or high.
//! Faults live in the design (`Design.faults`), so the staircase, the power
//! curve, the duty cycle and the diagram all show them; the machine check
//! still compares with the design as intended.

use kneepoint_engine::faults::{Faults, Stuck};
use kneepoint_engine::units::{from_display, unit};
use kneepoint_engine::{Design, Quantity};
use leptos::prelude::*;

use crate::field_form::{fault_words, value_text};
use crate::fmt::parse_number;
use crate::state::AppState;

/// The faults of the design now.
fn faults(st: &AppState) -> Faults {
    st.design.with(|d| d.faults.clone())
}

/// Words for the faults now, in the current units.
fn words(st: &AppState) -> Vec<String> {
    let u = st.units.get();
    st.design
        .with(|d| fault_words(&d.faults, d.relief_valve.full_flow_pa, u))
}

/// One numeric fault: blank means "sound".
#[component]
fn FaultField(
    /// Label for people.
    label: &'static str,
    /// Design path of the fault (`faults.…`), for its message and tests.
    path: &'static str,
    /// What kind of value is typed.
    quantity: Quantity,
    /// The value shown (SI of `quantity`), if the fault is on.
    get: fn(&Design) -> Option<f64>,
    /// Sets the fault from the typed value (SI of `quantity`), or clears it.
    set: fn(&mut Design, Option<f64>),
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let draft = RwSignal::new(None::<(String, u64)>);
    let id = format!("fault-{}", path.replace(['.', '_'], "-"));
    let msg_id = format!("{id}-msg");
    let text = move || {
        let g = st.generation.get();
        draft
            .get()
            .filter(|(_, dg)| *dg == g)
            .map(|(t, _)| t)
            .unwrap_or_else(|| {
                st.design
                    .with(get)
                    .map(|v| value_text(quantity, st.units.get(), v))
                    .unwrap_or_default()
            })
    };
    let message = Memo::new(move |_| {
        let typed = draft.get().and_then(|(t, _)| {
            (!t.trim().is_empty() && parse_number(&t).is_none()).then(|| {
                format!(
                    "Enter a number in {}, or leave blank for a sound part.",
                    unit(quantity, st.units.get()).symbol
                )
            })
        });
        typed.or_else(|| st.field_error(path))
    });
    let on_input = move |ev| {
        let t = event_target_value(&ev);
        let u = st.units.get_untracked();
        draft.set(Some((t.clone(), st.generation.get_untracked())));
        let v = if t.trim().is_empty() {
            Some(None)
        } else {
            parse_number(&t).map(|v| Some(from_display(quantity, u, v)))
        };
        if let Some(v) = v {
            st.rest.update(|d| set(d, v));
        }
    };
    view! {
        <div class="reading" class:invalid=move || message.get().is_some()>
            <label for=id.clone() class="reading-label">
                {label}
            </label>
            <span class="reading-row">
                <input
                    id=id
                    type="text"
                    inputmode="decimal"
                    autocomplete="off"
                    placeholder="sound"
                    prop:value=text
                    on:input=on_input
                    on:blur=move |_| draft.set(None)
                    aria-describedby=msg_id.clone()
                    data-testid=format!("fault-{path}")
                />
                <span class="unit" aria-hidden="true">
                    {move || unit(quantity, st.units.get()).symbol}
                </span>
            </span>
            <p id=msg_id class="field-msg">
                {move || message.get()}
            </p>
        </div>
    }
}

/// Typical faults, one tap each.
fn scenario(d: &mut Design, which: &str) {
    let f = &mut d.faults;
    match which {
        "large-worn" => f.large_volumetric_efficiency = Some(0.6),
        "small-worn" => f.small_volumetric_efficiency = Some(0.6),
        "check-leak" => {
            // A back-leak of a third of the small pump's flow at the relief
            // setting: clearly visible in the tank line.
            let q_s = d.small_pump.displacement_m3 * d.drive.speed_rpm / 60.0;
            f.check_leak_m3s_per_pa = Some(q_s / 3.0 / d.relief_valve.full_flow_pa);
        }
        "unloader-low" => {
            f.unloading_setting_pa = Some(0.4 * d.unloading_valve.setting_pa)
        }
        "unloader-high" => {
            f.unloading_setting_pa = Some(
                (1.8 * d.unloading_valve.setting_pa)
                    .min(0.9 * d.relief_valve.cracking_pa),
            );
        }
        "unloader-open" => f.unloader_stuck = Some(Stuck::Open),
        "unloader-shut" => f.unloader_stuck = Some(Stuck::Closed),
        "check-open" => f.check_stuck = Some(Stuck::Open),
        "check-shut" => f.check_stuck = Some(Stuck::Closed),
        "relief-low" => f.relief_scale = Some(0.6),
        _ => {}
    }
}

const SCENARIOS: &[(&str, &str)] = &[
    ("large-worn", "Worn large pump"),
    ("small-worn", "Worn small pump"),
    ("check-leak", "Check valve leaking back"),
    ("unloader-low", "Unloader set low"),
    ("unloader-high", "Unloader set high"),
    ("unloader-open", "Unloader stuck open"),
    ("unloader-shut", "Unloader stuck shut"),
    ("check-open", "Check valve stuck open"),
    ("check-shut", "Check valve stuck shut"),
    ("relief-low", "Relief set low"),
];

/// Clears every fault.
pub fn clear_faults(st: &AppState) {
    st.rest.update(|d| d.faults = Faults::default());
    st.generation.update(|g| *g += 1);
}

/// The fault simulator panel. `take_readings` fills the machine check
/// with what this simulated machine would show.
#[component]
pub fn FaultPanel(
    /// Fills the readings from the simulated machine.
    take_readings: Callback<()>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let stuck = move |s: Option<Stuck>, text: &'static str, code: &'static str| {
        view! {
            <button
                type="button"
                aria-pressed=move || (faults(&st).unloader_stuck == s).to_string()
                data-testid=format!("fault-stuck-{code}")
                on:click=move |_| st.rest.update(|d| d.faults.unloader_stuck = s)
            >
                {text}
            </button>
        }
    };
    let check = move |s: Option<Stuck>, text: &'static str, code: &'static str| {
        view! {
            <button
                type="button"
                aria-pressed=move || (faults(&st).check_stuck == s).to_string()
                data-testid=format!("fault-check-stuck-{code}")
                on:click=move |_| st.rest.update(|d| d.faults.check_stuck = s)
            >
                {text}
            </button>
        }
    };
    view! {
        <section class="panel faults-panel" aria-labelledby="faults-h" data-testid="fault-panel">
            <h2 id="faults-h">"Simulate faults (training)"</h2>
            <p class="quiet">
                "Make the design behave like a machine with a fault: the staircase, power, duty cycle \
                 and circuit diagram follow. The check above still compares with the design as \
                 intended."
            </p>
            <div class="scenarios" role="group" aria-label="Typical faults">
                {SCENARIOS
                    .iter()
                    .map(|&(code, text)| {
                        view! {
                            <button
                                type="button"
                                data-testid=format!("scenario-{code}")
                                on:click=move |_| {
                                    st.rest.update(|d| scenario(d, code));
                                    st.generation.update(|g| *g += 1);
                                }
                            >
                                {text}
                            </button>
                        }
                    })
                    .collect_view()}
            </div>
            <div class="fault-fields">
                <FaultField
                    label="Large pump volumetric efficiency"
                    path="faults.large_volumetric_efficiency"
                    quantity=Quantity::Percent
                    get=|d| d.faults.large_volumetric_efficiency
                    set=|d, v| d.faults.large_volumetric_efficiency = v
                />
                <FaultField
                    label="Small pump volumetric efficiency"
                    path="faults.small_volumetric_efficiency"
                    quantity=Quantity::Percent
                    get=|d| d.faults.small_volumetric_efficiency
                    set=|d, v| d.faults.small_volumetric_efficiency = v
                />
                <FaultField
                    label="Check valve back-leak at the relief setting"
                    path="faults.check_leak_m3s_per_pa"
                    quantity=Quantity::Flow
                    get=|d| d.faults.check_leak_m3s_per_pa.map(|k| k * d.relief_valve.full_flow_pa)
                    set=|d, v| {
                        d.faults.check_leak_m3s_per_pa = v.map(|q| q / d.relief_valve.full_flow_pa)
                    }
                />
                <FaultField
                    label="Unloading valve actually set at"
                    path="faults.unloading_setting_pa"
                    quantity=Quantity::Pressure
                    get=|d| d.faults.unloading_setting_pa
                    set=|d, v| d.faults.unloading_setting_pa = v
                />
                <FaultField
                    label="Relief valve at, share of its setting"
                    path="faults.relief_scale"
                    quantity=Quantity::Percent
                    get=|d| d.faults.relief_scale
                    set=|d, v| d.faults.relief_scale = v
                />
                <div class="observe">
                    <span id="stuck-label" class="reading-label">
                        "Unloading valve spool"
                    </span>
                    <div class="toggle big" role="group" aria-labelledby="stuck-label">
                        {stuck(None, "Free", "free")}
                        {stuck(Some(Stuck::Open), "Stuck open", "open")}
                        {stuck(Some(Stuck::Closed), "Stuck shut", "shut")}
                    </div>
                </div>
                <div class="observe">
                    <span id="check-stuck-label" class="reading-label">
                        "Check valve poppet"
                    </span>
                    <div class="toggle big" role="group" aria-labelledby="check-stuck-label">
                        {check(None, "Free", "free")}
                        {check(Some(Stuck::Open), "Stuck open", "open")}
                        {check(Some(Stuck::Closed), "Stuck shut", "shut")}
                    </div>
                </div>
            </div>
            <div class="row-actions">
                <button
                    type="button"
                    class="primary"
                    data-testid="take-readings"
                    on:click=move |_| take_readings.run(())
                >
                    "Take readings from this simulated machine"
                </button>
                <button
                    type="button"
                    data-testid="clear-faults"
                    disabled=move || faults(&st).is_empty()
                    on:click=move |_| clear_faults(&st)
                >
                    "Clear all faults"
                </button>
            </div>
        </section>
    }
}

/// A flag on every view while faults are simulated, with a one-tap clear.
#[component]
pub fn FaultFlag() -> impl IntoView {
    let st = expect_context::<AppState>();
    move || {
        let w = words(&st);
        (!w.is_empty()).then(|| {
            view! {
                <div class="fault-flag" role="status" data-testid="fault-flag">
                    <p>
                        <strong>"Simulated faults on: "</strong>
                        {w.join("; ")}
                        ". Results show a faulty machine, not the design."
                    </p>
                    <button
                        type="button"
                        data-testid="fault-flag-clear"
                        on:click=move |_| clear_faults(&st)
                    >
                        "Clear faults"
                    </button>
                </div>
            }
        })
    }
}
