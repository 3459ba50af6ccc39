//! The two SVG charts, drawn from [`crate::chart`] geometry, and the
//! readout of p, Q, v and P under the pointer (mouse, touch or keys).

use kneepoint_engine::units::format;
use kneepoint_engine::{Quantity, UnitSystem};
use leptos::prelude::*;
use wasm_bindgen::JsCast;

use crate::chart::{self, band_label_y, Frame, Mark, Scale, Tick};
use crate::state::AppState;
use crate::summary::motor_line;

/// The pressure under the pointer (Pa), shared by both charts.
#[derive(Clone, Copy)]
pub struct Cursor(pub RwSignal<Option<f64>>);

pub(crate) fn view_box(f: &Frame) -> String {
    format!("0 0 {} {}", f.width, f.height)
}

pub(crate) fn num(v: f64) -> String {
    crate::fmt::fixed(v, 1)
}

/// Grid lines, ticks and titles of a chart.
pub(crate) fn axes(
    f: Frame,
    x_ticks: Vec<Tick>,
    y_ticks: Vec<Tick>,
    y2_ticks: Vec<Tick>,
    titles: (String, String, Option<String>),
) -> impl IntoView {
    let (xt, yt, y2t) = titles;
    let y_mid = 0.5 * (f.top + f.bottom);
    view! {
        <g class="grid" aria-hidden="true">
            {x_ticks
                .iter()
                .map(|t| {
                    view! { <line x1=num(t.at) x2=num(t.at) y1=num(f.top) y2=num(f.bottom) /> }
                })
                .collect_view()}
            {y_ticks
                .iter()
                .map(|t| {
                    view! { <line x1=num(f.left) x2=num(f.right) y1=num(t.at) y2=num(t.at) /> }
                })
                .collect_view()}
        </g>
        <g class="axis" aria-hidden="true">
            <line class="axis-line" x1=num(f.left) x2=num(f.right) y1=num(f.bottom) y2=num(f.bottom) />
            <line class="axis-line" x1=num(f.left) x2=num(f.left) y1=num(f.top) y2=num(f.bottom) />
            {x_ticks
                .into_iter()
                .map(|t| {
                    view! {
                        <text class="tick" x=num(t.at) y=num(f.bottom + 15.0) text-anchor="middle">
                            {t.label}
                        </text>
                    }
                })
                .collect_view()}
            {y_ticks
                .into_iter()
                .map(|t| {
                    view! {
                        <text class="tick" x=num(f.left - 6.0) y=num(t.at + 4.0) text-anchor="end">
                            {t.label}
                        </text>
                    }
                })
                .collect_view()}
            {y2_ticks
                .into_iter()
                .map(|t| {
                    view! {
                        <text class="tick tick-y2" x=num(f.right + 6.0) y=num(t.at + 4.0) text-anchor="start">
                            {t.label}
                        </text>
                    }
                })
                .collect_view()}
            <text class="title" x=num(0.5 * (f.left + f.right)) y=num(f.height - 6.0) text-anchor="middle">
                {xt}
            </text>
            <text
                class="title"
                x="0"
                y="0"
                text-anchor="middle"
                transform=format!("translate(14 {}) rotate(-90)", num(y_mid))
            >
                {yt}
            </text>
            {y2t
                .map(|t| {
                    view! {
                        <text
                            class="title title-y2"
                            x="0"
                            y="0"
                            text-anchor="middle"
                            transform=format!("translate({} {}) rotate(90)", num(f.width - 12.0), num(y_mid))
                        >
                            {t}
                        </text>
                    }
                })}
        </g>
    }
}

/// A marker with its label (and a leader line when the label sits away).
fn marker(m: Mark, class: &'static str, shape: &'static str) -> impl IntoView {
    let far = (m.ly - 4.0 - m.y).abs() > 22.0;
    let leader = far.then(|| {
        view! { <line class="leader" x1=num(m.x) y1=num(m.y) x2=num(m.lx) y2=num(m.ly - 4.0) /> }
    });
    let dot = match shape {
        "diamond" => view! {
            <path class="dot" d=format!("M{},{}l5,5l-5,5l-5,-5z", num(m.x), num(m.y - 5.0)) />
        }
        .into_any(),
        _ => view! { <circle class="dot" cx=num(m.x) cy=num(m.y) r="4.5" /> }.into_any(),
    };
    view! {
        <g
            class=class
            data-kind=m.kind
            data-knee-kind=(class == "knee").then_some(m.kind)
            data-pressure-pa=m.pressure_pa.to_string()
        >
            {leader}
            {dot}
            <text class="mark-label" x=num(m.lx) y=num(m.ly) text-anchor=m.anchor.svg()>
                {m.label}
            </text>
        </g>
    }
}

/// Pointer and key handling shared by both charts: the pointer's pressure
/// goes to the shared cursor.
pub(crate) fn pointer_pressure(
    ev: &web_sys::PointerEvent,
    f: &Frame,
    x: &Scale,
) -> Option<f64> {
    let el: web_sys::Element = ev.current_target()?.dyn_into().ok()?;
    let r = el.get_bounding_client_rect();
    if r.width() <= 0.0 {
        return None;
    }
    let px = (f64::from(ev.client_x()) - r.left()) * f.width / r.width();
    let px = px.clamp(f.left, f.right);
    Some(x.invert(px).max(0.0))
}

pub(crate) fn key_step(key: &str, now: Option<f64>, x: &Scale) -> Option<Option<f64>> {
    let step = (x.d1 - x.d0) / 50.0;
    let p = now.unwrap_or(0.0);
    Some(Some(match key {
        "ArrowRight" | "ArrowUp" => (p + step).min(x.d1),
        "ArrowLeft" | "ArrowDown" => (p - step).max(x.d0),
        "Home" => x.d0,
        "End" => x.d1,
        "Escape" => return Some(None),
        _ => return None,
    }))
}

/// The SVG element of the staircase and power charts, with pointer and key
/// handlers feeding the shared pressure cursor.
fn chart_svg(
    f: Frame,
    x: Scale,
    cursor: Cursor,
    label: String,
    testid: &'static str,
    body: AnyView,
) -> impl IntoView {
    interactive_svg(f, x, cursor.0, "chart-svg", label, testid, body)
}

/// An SVG chart whose x value under the pointer, finger or arrow keys is
/// written to `c`, with a vertical cursor line drawn at `c`. Shared by the
/// pressure charts and the cycle timelines.
pub(crate) fn interactive_svg(
    f: Frame,
    x: Scale,
    c: RwSignal<Option<f64>>,
    class: &'static str,
    label: String,
    testid: &'static str,
    body: AnyView,
) -> impl IntoView {
    let line = move || {
        c.get().map(|v| {
            let xx = num(x.map(v));
            view! { <line class="cursor" x1=xx.clone() x2=xx y1=num(f.top) y2=num(f.bottom) /> }
        })
    };
    view! {
        <svg
            class=class
            viewBox=view_box(&f)
            role="img"
            aria-label=label
            tabindex="0"
            data-testid=testid
            data-chart-ready="1"
            on:pointermove=move |ev: web_sys::PointerEvent| {
                if let Some(p) = pointer_pressure(&ev, &f, &x) {
                    c.set(Some(p));
                }
            }
            on:pointerdown=move |ev: web_sys::PointerEvent| {
                if let Some(p) = pointer_pressure(&ev, &f, &x) {
                    c.set(Some(p));
                }
            }
            on:pointerleave=move |ev: web_sys::PointerEvent| {
                if ev.pointer_type() == "mouse" {
                    c.set(None);
                }
            }
            on:keydown=move |ev: web_sys::KeyboardEvent| {
                if let Some(next) = key_step(&ev.key(), c.get_untracked(), &x) {
                    ev.prevent_default();
                    c.set(next);
                }
            }
        >
            {body}
            {line}
        </svg>
    }
}

/// Shown in place of a chart before any valid design.
fn placeholder() -> impl IntoView {
    view! { <p class="placeholder">"No result yet: fix the marked inputs."</p> }
}

/// The pressure-flow staircase with regimes, knees and operating points.
#[component]
pub fn StaircaseChart(
    /// Drawing width (px).
    #[prop(into)]
    width: Signal<f64>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let cursor = expect_context::<Cursor>();
    let geom = Memo::new(move |_| {
        let (u, w) = (st.units.get(), width.get());
        st.shown
            .with(|g| g.as_ref().map(|g| chart::staircase(&g.report, u, w)))
    });
    move || {
        let Some(g) = geom.get() else {
            return placeholder().into_any();
        };
        let f = g.frame;
        let label = format!(
            "Pressure-flow staircase: flow to the cylinder against system pressure, {} knees marked.",
            g.knees.len()
        );
        let bands = g
            .bands
            .iter()
            .map(|b| {
                let cx = 0.5 * (b.x0 + b.x1);
                view! {
                    <rect
                        class=format!("band {}", b.class)
                        x=num(b.x0)
                        y=num(f.top)
                        width=num((b.x1 - b.x0).max(0.0))
                        height=num(f.bottom - f.top)
                    />
                    <text class="band-label" x=num(cx) y=num(band_label_y(&f)) text-anchor="middle">
                        {b.label.clone()}
                    </text>
                }
            })
            .collect_view();
        let body = view! {
            <g class="bands">{bands}</g>
            {axes(
                f,
                g.x_ticks.clone(),
                g.y_ticks.clone(),
                g.y2_ticks.clone(),
                (g.x_title.clone(), g.y_title.clone(), Some(g.y2_title.clone())),
            )}
            <path class="curve curve-flow" d=g.path.clone() />
            <g class="knees">
                {g.knees.iter().cloned().map(|m| marker(m, "knee", "circle")).collect_view()}
            </g>
            <g class="points">
                {g.points.iter().cloned().map(|m| marker(m, "op-point", "diamond")).collect_view()}
            </g>
        }
        .into_any();
        let compact = f.compact();
        let key = g
            .knees
            .iter()
            .chain(&g.points)
            .map(|m| {
                let n = m.label.clone();
                view! { <li data-kind=m.kind>{compact.then(|| format!("{n} "))} {m.full.clone()}</li> }
            })
            .collect_view();
        view! {
            {chart_svg(f, g.x, cursor, label, "staircase-svg", body)}
            <ol class="chart-key" class:sr-only=!compact aria-label="Marked points" data-testid="staircase-key">
                {key}
            </ol>
        }
        .into_any()
    }
}

/// Shaft power against system pressure: hi-lo, one fixed pump, the motor.
#[component]
pub fn PowerChart(
    /// Drawing width (px).
    #[prop(into)]
    width: Signal<f64>,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let cursor = expect_context::<Cursor>();
    let geom = Memo::new(move |_| {
        let (u, w) = (st.units.get(), width.get());
        st.shown.with(|g| {
            g.as_ref().map(|g| {
                let motor = motor_line(&g.design, &g.report, u);
                chart::power(&g.report, u, motor, w)
            })
        })
    });
    move || {
        let Some(g) = geom.get() else {
            return placeholder().into_any();
        };
        let f = g.frame;
        let motor = g.motor.clone().map(|(yy, m)| {
            view! {
                <g class="motor" data-kind="motor" data-power-w=m.value_si.to_string()>
                    <line class="motor-line" x1=num(f.left) x2=num(f.right) y1=num(yy) y2=num(yy) />
                    <text class="mark-label" x=num(m.lx) y=num(m.ly)>
                        {m.label}
                    </text>
                </g>
            }
        });
        let equal = g.equal_corner.clone().map(|m| {
            view! {
                <g class="equal-corner" data-pressure-pa=m.pressure_pa.to_string()>
                    <line class="equal-line" x1=num(m.x) x2=num(m.x) y1=num(f.top) y2=num(f.bottom) />
                    <text class="mark-label small" x=num(m.lx) y=num(m.ly) text-anchor=m.anchor.svg()>
                        {m.label}
                    </text>
                </g>
            }
        });
        let body = view! {
            {axes(
                f,
                g.x_ticks.clone(),
                g.y_ticks.clone(),
                Vec::new(),
                (g.x_title.clone(), g.y_title.clone(), None),
            )}
            {equal}
            <path class="curve curve-single" d=g.single_path.clone() />
            <path class="curve curve-power" d=g.path.clone() />
            {motor}
            <g class="corners">
                {g.corners.iter().cloned().map(|m| marker(m, "corner", "circle")).collect_view()}
            </g>
        }
        .into_any();
        chart_svg(
            f,
            g.x,
            cursor,
            "Shaft power against system pressure, with the motor rating and one fixed pump for comparison."
                .into(),
            "power-svg",
            body,
        )
        .into_any()
    }
}

/// The values under the cursor, in words.
#[component]
pub fn Readout() -> impl IntoView {
    let st = expect_context::<AppState>();
    let cursor = expect_context::<Cursor>();
    let text = move || {
        let u: UnitSystem = st.units.get();
        let p = cursor.0.get()?;
        st.shown.with(|g| {
            let g = g.as_ref()?;
            let r = chart::read_at(&g.report.curves.points, p)?;
            Some(format!(
                "p {} · Q {} · v {} · P {} (one fixed pump: {})",
                format(Quantity::Pressure, u, r.pressure_pa),
                format(Quantity::Flow, u, r.flow_m3s),
                format(Quantity::Velocity, u, r.speed_ms),
                format(Quantity::Power, u, r.power_w),
                format(Quantity::Power, u, r.single_w)
            ))
        })
    };
    view! {
        <p class="readout" data-testid="readout" aria-live="polite">
            {move || {
                text()
                    .unwrap_or_else(|| {
                        "Point at a chart, touch it, or focus it and use the arrow keys to read p, Q, v and P."
                            .into()
                    })
            }}
        </p>
    }
}

/// Legend of the staircase.
#[component]
pub fn StaircaseLegend() -> impl IntoView {
    view! {
        <ul class="legend" aria-label="Staircase legend">
            <li>
                <span class="sw sw-line sw-flow"></span>
                "Flow to the cylinder (left axis) and extend speed (right axis)"
            </li>
            <li>
                <span class="sw band-both"></span>
                "Both pumps"
            </li>
            <li>
                <span class="sw band-unloading"></span>
                "Unloader opening"
            </li>
            <li>
                <span class="sw band-small"></span>
                "Small pump only"
            </li>
            <li>
                <span class="sw band-relief"></span>
                "Relief passing"
            </li>
            <li>
                <span class="sw sw-dot"></span>
                "Knee"
            </li>
            <li>
                <span class="sw sw-diamond"></span>
                "Operating point"
            </li>
        </ul>
    }
}

/// Legend of the power chart.
#[component]
pub fn PowerLegend() -> impl IntoView {
    view! {
        <ul class="legend" aria-label="Power chart legend">
            <li>
                <span class="sw sw-line sw-power"></span>
                "Hi-lo shaft power"
            </li>
            <li>
                <span class="sw sw-line sw-single"></span>
                "One fixed pump of both displacements"
            </li>
            <li>
                <span class="sw sw-line sw-motor"></span>
                "Motor rating"
            </li>
            <li>
                <span class="sw sw-line sw-equal"></span>
                "Equal-corner unloading pressure"
            </li>
            <li>
                <span class="sw sw-dot"></span>
                "Corner"
            </li>
        </ul>
    }
}

/// The width (px) of the element behind `node`, measured after the first
/// frame and again on every window resize, for chart drawings that are laid
/// out in pixels. Starts at 640 px until measured.
pub fn use_box_width(node: NodeRef<leptos::html::Div>) -> RwSignal<f64> {
    let width = RwSignal::new(640.0);
    // `try_` access: a frame or resize may arrive after the view that owns
    // these signals was closed (switching views, rotating a tablet).
    let remeasure = move || {
        let Some(el) = node.try_get_untracked().flatten() else {
            return;
        };
        let w = f64::from(el.client_width());
        match width.try_get_untracked() {
            Some(old) if w > 0.0 && (w - old).abs() >= 1.0 => {
                width.try_set(w);
            }
            _ => {}
        }
    };
    request_animation_frame(remeasure);
    // The listener lives on the window: remove it with the view.
    let listener = window_event_listener(leptos::ev::resize, move |_| remeasure());
    on_cleanup(move || listener.remove());
    width
}
