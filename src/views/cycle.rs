//! The duty-cycle view: the load profile, the timeline, the whole-cycle
//! figures, the motor and heat cards, the targets and the cycle warnings.
//! Everything reads the cycle of the last good design
//! ([`crate::state::AppState::cycle`]); it follows every edit live.

use kneepoint_engine::fields::Group;
use kneepoint_engine::Quantity;
use leptos::prelude::*;

use crate::components::charts::use_box_width;
use crate::components::cycle_input::CycleNumber;
use crate::components::cycle_results::{CycleTotals, CycleWarnings, TargetsCard};
use crate::components::field::FieldGroup;
use crate::components::heat_card::HeatCard;
use crate::components::motor_card::MotorCard;
use crate::components::segments::ProfileEditor;
use crate::components::timeline::{
    MotionTimelineChart, PowerTimelineChart, TimeCursor, TimeReadout, TimelineLegend,
};
use crate::state::{AppState, CycleState};

/// What is on screen when the design or the cycle cannot be evaluated.
#[component]
fn CycleStatus() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    move || {
        let u = st.units.get();
        let invalid = st.outcome.with(|o| o.as_ref().err().map(|e| e.0.len()));
        let stall = cy.cycle.with(|c| match c {
            Some(Err(e)) => Some(e.message(u)),
            _ => None,
        });
        if let Some(n) = invalid {
            Some(view! {
                <div class="stale" role="alert" data-testid="cycle-stale">
                    <p>
                        <strong>"These results are for the last valid design."</strong>
                        {format!(
                            " {n} input{} marked in red: fix {} to update them.",
                            if n == 1 { " is" } else { "s are" },
                            if n == 1 { "it" } else { "them" }
                        )}
                    </p>
                </div>
            }
            .into_any())
        } else {
            stall.map(|m| {
                view! {
                    <div class="stale" role="alert" data-testid="cycle-stale">
                        <p>
                            <strong>"The cycle cannot run: "</strong>
                            {m}
                        </p>
                        <p>"The figures below are for the last cycle that ran."</p>
                    </div>
                }
                .into_any()
            })
        }
    }
}

/// Dead volume and valve-centre pressure.
fn more_cycle_inputs(st: AppState) -> impl IntoView {
    let dead = Signal::derive(move || Some(st.rest.with(|d| d.cycle.dead_volume_m3)));
    let set_dead = Callback::new(move |v: Option<f64>| {
        if let Some(v) = v {
            st.rest.update(|d| d.cycle.dead_volume_m3 = v);
        }
    });
    let centre =
        Signal::derive(move || Some(st.rest.with(|d| d.cycle.centre_pressure_pa)));
    let set_centre = Callback::new(move |v: Option<f64>| {
        if let Some(v) = v {
            st.rest.update(|d| d.cycle.centre_pressure_pa = v);
        }
    });
    view! {
        <details class="advanced">
            <summary>"Oil volume and valve centre (2)"</summary>
            <CycleNumber
                label="Oil in lines and valves (pressure side)"
                quantity=Quantity::Volume
                path="cycle.dead_volume_m3"
                value=dead
                on_set=set_dead
            />
            <CycleNumber
                label="Pump pressure with the valve centred"
                quantity=Quantity::Pressure
                path="cycle.centre_pressure_pa"
                value=centre
                on_set=set_centre
            />
        </details>
    }
}

/// The duty-cycle view.
#[component]
pub fn CycleView() -> impl IntoView {
    let st = expect_context::<AppState>();
    provide_context(CycleState::new(&st));
    provide_context(TimeCursor(RwSignal::new(None)));
    let charts_box = NodeRef::<leptos::html::Div>::new();
    let width = use_box_width(charts_box);
    view! {
        <div class="cycle">
            <section class="cycle-charts panel" aria-labelledby="timeline-h">
                <h2 id="timeline-h" class="sr-only">"Cycle timeline"</h2>
                <div node_ref=charts_box class="chart-box">
                    <figure class="chart" data-testid="timeline">
                        <figcaption>"Position and pressure over one cycle"</figcaption>
                        <MotionTimelineChart width=width />
                    </figure>
                    <TimeReadout />
                    <figure class="chart">
                        <figcaption>"Shaft power over one cycle"</figcaption>
                        <PowerTimelineChart width=width />
                    </figure>
                    <TimelineLegend />
                </div>
            </section>
            <section class="cycle-profile panel" aria-labelledby="profile-h">
                <h2 id="profile-h">"Load profile"</h2>
                <ProfileEditor />
                {more_cycle_inputs(st)}
                <details class="advanced circuit-inputs">
                    <summary>"Pumps and valves (the Circuit view's inputs)"</summary>
                    <FieldGroup group=Group::Pumps />
                    <FieldGroup group=Group::Valves />
                </details>
            </section>
            <div class="cycle-results">
                <CycleStatus />
                <CycleTotals />
                <MotorCard />
                <HeatCard />
                <TargetsCard />
                <CycleWarnings />
            </div>
        </div>
    }
}
