//! The circuit view: inputs by group, the staircase and power charts,
//! results, and saved designs; plus the one-page printed sheet.

use kneepoint_engine::fields::{Group, FIELDS};
use kneepoint_engine::units::unit;
use leptos::prelude::*;

use crate::components::charts::use_box_width;
use crate::components::charts::{
    PowerChart, PowerLegend, Readout, StaircaseChart, StaircaseLegend,
};
use crate::components::diagram::CircuitDiagram;
use crate::components::field::FieldGroup;
use crate::components::presets::Presets;
use crate::components::results::Results;
use crate::components::safety::SafetyNotes;
use crate::model::value_text;
use crate::split::{load, split_view, Unloaded};
use crate::state::AppState;
use leptos::wasm_split::wasm_split;

/// Every input with its value, for the printed sheet only.
#[component]
fn PrintedInputs() -> impl IntoView {
    let st = expect_context::<AppState>();
    view! {
        <table class="print-only inputs-table">
            <caption>"Inputs"</caption>
            <tbody>
                {move || {
                    let u = st.units.get();
                    let name = st.rest.with(|d| d.name.clone());
                    let mut rows = vec![
                        view! {
                            <tr>
                                <th scope="row">"Design"</th>
                                <td>{name}</td>
                            </tr>
                        }
                            .into_any(),
                    ];
                    rows.extend(
                        FIELDS
                            .iter()
                            .zip(st.values)
                            .map(|(s, v)| {
                                view! {
                                    <tr>
                                        <th scope="row">{s.label}</th>
                                        <td>
                                            {format!(
                                                "{} {}",
                                                value_text(s, u, v.get()),
                                                unit(s.quantity, u).symbol,
                                            )}
                                        </td>
                                    </tr>
                                }
                                    .into_any()
                            }),
                    );
                    rows
                }}
            </tbody>
        </table>
    }
}

/// The circuit diagram, loaded the first time it is shown.
#[wasm_split(kneepoint_circuit_diagram, wasm_split_path = ::leptos::wasm_split, fallible)]
fn circuit_diagram() -> Result<AnyView, Unloaded> {
    Ok(view! { <CircuitDiagram /> }.into_any())
}

/// A button that shows the circuit diagram under the charts, and hides it.
#[component]
fn DiagramOnDemand() -> impl IntoView {
    let open = RwSignal::new(false);
    view! {
        <button
            type="button"
            class="diagram-toggle"
            aria-expanded=move || open.get().to_string()
            data-testid="diagram-toggle"
            on:click=move |_| open.update(|o| *o = !*o)
        >
            {move || {
                if open.get() {
                    "Hide the circuit diagram"
                } else {
                    "Show the circuit diagram (ISO 1219) at the cursor"
                }
            }}
        </button>
        {move || {
            open.get()
                .then(|| split_view("The circuit diagram", "Drawing the circuit…", load(circuit_diagram)))
        }}
    }
}

/// Inputs, charts and results for one hi-lo circuit.
#[component]
pub fn CircuitView() -> impl IntoView {
    let charts_box = NodeRef::<leptos::html::Div>::new();
    let width = use_box_width(charts_box);
    view! {
        <div class="circuit">
            <section class="charts panel" aria-labelledby="charts-h">
                <h2 id="charts-h" class="sr-only">"Charts"</h2>
                <div node_ref=charts_box class="chart-box">
                    <figure class="chart" data-testid="staircase">
                        <figcaption>"Pressure-flow staircase"</figcaption>
                        <StaircaseChart width=width />
                        <StaircaseLegend />
                    </figure>
                    <Readout />
                    <figure class="chart" data-testid="power">
                        <figcaption>"Shaft power"</figcaption>
                        <PowerChart width=width />
                        <PowerLegend />
                    </figure>
                    // The circuit at the pressure under the chart cursor,
                    // shown when asked for (its part of the wasm loads then).
                    <DiagramOnDemand />
                </div>
            </section>
            <section class="inputs panel" aria-labelledby="inputs-h">
                <h2 id="inputs-h">"Inputs"</h2>
                <FieldGroup group=Group::Pumps />
                <FieldGroup group=Group::Valves />
                <FieldGroup group=Group::Cylinder />
            </section>
            <PrintedInputs />
            <Results />
            <Presets />
            <section class="print-only print-safety">
                <h2>"Safety"</h2>
                <SafetyNotes />
            </section>
        </div>
    }
}
