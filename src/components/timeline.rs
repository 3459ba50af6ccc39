//! The duty-cycle timeline: position and pressure against time, shaft power
//! against time, segments shaded and named, and a readout of the moment
//! under the pointer (mouse, touch or arrow keys), drawn from
//! [`crate::timeline_geom`].

use kneepoint_engine::units::format;
use kneepoint_engine::Quantity;
use leptos::prelude::*;

use crate::chart::{capitalise, Frame, Scale};
use crate::components::charts::{axes, interactive_svg, num};
use crate::state::{AppState, CycleState};
use crate::timeline_geom::{self, band_label_y, Label, SegmentBand};

/// The cycle time under the pointer (s), shared by both timeline charts.
#[derive(Clone, Copy)]
pub struct TimeCursor(pub RwSignal<Option<f64>>);

fn placeholder() -> AnyView {
    view! {
        <p class="placeholder">"No cycle yet: fix the marked inputs or the profile."</p>
    }
    .into_any()
}

fn bands_view(bands: &[SegmentBand], f: &Frame) -> impl IntoView {
    bands
        .iter()
        .map(|b| {
            let cx = 0.5 * (b.x0 + b.x1);
            view! {
                <g class="seg-band" data-segment=b.index.to_string()>
                    <title>{b.title.clone()}</title>
                    <rect
                        class=format!("band {}", b.class)
                        x=num(b.x0)
                        y=num(f.top)
                        width=num((b.x1 - b.x0).max(0.0))
                        height=num(f.bottom - f.top)
                    />
                    <line class="seg-edge" x1=num(b.x0) x2=num(b.x0) y1=num(f.top - 16.0) y2=num(f.bottom) />
                    <text class="band-label" x=num(cx) y=num(band_label_y(f)) text-anchor="middle">
                        {b.label.clone()}
                    </text>
                </g>
            }
        })
        .collect_view()
}

fn label_view(l: Label, class: &'static str) -> impl IntoView {
    view! {
        <text class=class x=num(l.x) y=num(l.y) text-anchor=l.anchor.svg()>
            {l.text}
        </text>
    }
}

/// The SVG with the pointer and key handlers feeding the time cursor.
fn timeline_svg(
    f: Frame,
    x: Scale,
    label: String,
    testid: &'static str,
    body: AnyView,
) -> impl IntoView {
    let c = expect_context::<TimeCursor>().0;
    interactive_svg(f, x, c, "chart-svg timeline-svg", label, testid, body)
}

/// Piston position and pressure against time.
#[component]
pub fn MotionTimelineChart(
    /// Drawing width (px).
    #[prop(into)]
    width: Signal<f64>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    let geom = Memo::new(move |_| {
        let (u, w) = (st.units.get(), width.get());
        cy.cycle_shown
            .with(|r| r.as_ref().map(|r| timeline_geom::motion(r, u, w)))
    });
    move || {
        let Some(g) = geom.get() else {
            return placeholder();
        };
        let f = g.frame;
        let chamber = (!g.chamber_path.is_empty()).then(
            || view! { <path class="curve curve-chamber" d=g.chamber_path.clone() /> },
        );
        let body = view! {
            <g class="bands">{bands_view(&g.bands, &f)}</g>
            {axes(
                f,
                g.x_ticks.clone(),
                g.y_ticks.clone(),
                g.y2_ticks.clone(),
                (g.x_title.clone(), g.y_title.clone(), Some(g.y2_title.clone())),
            )}
            {chamber}
            <path class="curve curve-pressure" d=g.pressure_path.clone() />
            <path class="curve curve-position" d=g.position_path.clone() />
        }
        .into_any();
        timeline_svg(
            f,
            g.x,
            format!(
                "Piston position and pressure against time over one cycle of {} segments.",
                g.bands.len()
            ),
            "timeline-motion",
            body,
        )
        .into_any()
    }
}

/// Shaft power against time, with its RMS level and the motor rating.
#[component]
pub fn PowerTimelineChart(
    /// Drawing width (px).
    #[prop(into)]
    width: Signal<f64>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    let geom = Memo::new(move |_| {
        let (u, w) = (st.units.get(), width.get());
        cy.cycle_shown
            .with(|r| r.as_ref().map(|r| timeline_geom::power(r, u, w)))
    });
    move || {
        let Some(g) = geom.get() else {
            return placeholder();
        };
        let f = g.frame;
        let motor = g.motor.clone().map(|m| {
            view! {
                <g class="motor" data-power-w=m.value_si.to_string()>
                    <line class="motor-line" x1=num(f.left) x2=num(f.right) y1=num(m.y) y2=num(m.y) />
                    {label_view(m.label, "mark-label")}
                </g>
            }
        });
        let (px, py, pl) = g.peak.clone();
        let body = view! {
            <g class="bands">{bands_view(&g.bands, &f)}</g>
            {axes(
                f,
                g.x_ticks.clone(),
                g.y_ticks.clone(),
                Vec::new(),
                (g.x_title.clone(), g.y_title.clone(), None),
            )}
            <g class="rms" data-power-w=g.rms.value_si.to_string()>
                <line class="rms-line" x1=num(f.left) x2=num(f.right) y1=num(g.rms.y) y2=num(g.rms.y) />
                {label_view(g.rms.label.clone(), "mark-label")}
            </g>
            {motor}
            <path class="curve curve-power" d=g.power_path.clone() />
            <g class="peak">
                <circle class="dot" cx=num(px) cy=num(py) r="4.5" />
                {label_view(pl, "mark-label")}
            </g>
        }
        .into_any();
        timeline_svg(
            f,
            g.x,
            "Shaft power against time, with the RMS power and the motor rating.".into(),
            "timeline-power",
            body,
        )
        .into_any()
    }
}

/// The values at the cursor's time, in words.
#[component]
pub fn TimeReadout() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cy = expect_context::<CycleState>();
    let c = expect_context::<TimeCursor>().0;
    let text = move || {
        let u = st.units.get();
        let t = c.get()?;
        cy.cycle_shown.with(|r| {
            let r = r.as_ref()?;
            let g = timeline_geom::read_at(r, t)?;
            let label = r.segments.get(g.segment).map_or("", |s| s.label);
            let chamber = if (g.chamber_pa - g.p_pa).abs() > 0.01 * g.p_pa.max(1e5) {
                format!(
                    " (cylinder {})",
                    format(Quantity::Pressure, u, g.chamber_pa)
                )
            } else {
                String::new()
            };
            Some(format!(
                "t {} s · {} {} · x {} · v {} · p {}{} · Q {} · P {}",
                crate::fmt::fixed(g.t_s, 2),
                g.segment + 1,
                capitalise(label),
                format(Quantity::Length, u, g.x_m),
                format(Quantity::Velocity, u, g.v_ms),
                format(Quantity::Pressure, u, g.p_pa),
                chamber,
                format(Quantity::Flow, u, g.q_m3s),
                format(Quantity::Power, u, g.power_w),
            ))
        })
    };
    view! {
        <p class="readout" data-testid="cycle-readout" aria-live="polite">
            {move || {
                text()
                    .unwrap_or_else(|| {
                        "Point at a timeline, touch it, or focus it and use the arrow keys to read \
                         position, speed, pressure, flow and power at that moment."
                            .into()
                    })
            }}
        </p>
    }
}

/// Legend of both timelines.
#[component]
pub fn TimelineLegend() -> impl IntoView {
    view! {
        <ul class="legend" aria-label="Timeline legend">
            <li>
                <span class="sw sw-line sw-position"></span>
                "Position (left axis)"
            </li>
            <li>
                <span class="sw sw-line sw-pressure"></span>
                "Pump pressure (right axis)"
            </li>
            <li>
                <span class="sw sw-line sw-chamber"></span>
                "Cylinder pressure where it differs (held or trapped)"
            </li>
            <li>
                <span class="sw sw-line sw-power"></span>
                "Shaft power"
            </li>
            <li>
                <span class="sw sw-line sw-rms"></span>
                "RMS power"
            </li>
            <li>
                <span class="sw sw-line sw-motor"></span>
                "Motor rating"
            </li>
        </ul>
    }
}
