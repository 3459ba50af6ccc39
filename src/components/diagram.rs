//! The live circuit diagram in ISO 1219-1 symbols, drawn in SVG from
//! [`crate::diagram_geom`]: which pump delivers, the check valve open or
//! closed, the unloading valve's opening, the relief passing, the lines
//! that carry flow, with pressures and flows in the chosen units.
//!
//! Test hooks: `data-state` on the check valve (`open|closed`), the relief
//! (`passing|closed`) and the unloader (`shut|opening|open`, with
//! `data-open-fraction`), `data-delivers` on the large pump, `data-active`
//! on each flow line, `data-pressure-pa` on the drawing.

use kneepoint_engine::field::component_states;
use leptos::prelude::*;

use crate::components::charts::Cursor;
use crate::diagram_geom::{
    self as g, arrow_head, diagram_state, polyline, shown_pressure, spring, tank,
    triangle_up, DiagramState, Flows, Pt, BARREL, BUS_Y, CHECK, DCV, DCV_SQ, G1, G2, G3,
    GAUGE_R, MOTOR, PILOT_TAP, PUMP_L, PUMP_R, PUMP_S, RELIEF, RETURN_Y, UNLOADER,
    VALVE_HALF,
};
use crate::state::AppState;

fn n(v: f64) -> String {
    crate::fmt::trim_zeros(format!("{v:.1}"))
}

/// A gauge: circle with a diagonal arrow, on a stub from `tap`.
fn gauge(at: Pt, tap: Pt, name: &'static str) -> impl IntoView {
    let r = GAUGE_R;
    view! {
        <g class="dg-gauge" data-gauge=name>
            <path class="dg-line" d=polyline(&[tap, Pt(if tap.0 < at.0 { at.0 - r } else { at.0 + r }, at.1)]) />
            <circle class="dg-sym" cx=n(at.0) cy=n(at.1) r=n(r) />
            <path class="dg-thin" d=polyline(&[Pt(at.0 - 6.0, at.1 + 6.0), Pt(at.0 + 5.0, at.1 - 5.0)]) />
            <path class="dg-fill" d=arrow_head(Pt(at.0 + 6.0, at.1 - 6.0), 1.0, -1.0, 2.2) />
        </g>
    }
}

/// A pressure valve envelope (relief or unloading) at `c`: one square,
/// arrow offset from the P–T path by `offset` (0 = in line, passing),
/// adjustable spring on the right.
fn pressure_valve(c: Pt, offset: Signal<f64>) -> impl IntoView {
    let h = VALVE_HALF;
    let arrow = move || {
        let x = c.0 - offset.get();
        polyline(&[Pt(x, c.1 - h + 6.0), Pt(x, c.1 + h - 9.0)])
    };
    let head = move || arrow_head(Pt(c.0 - offset.get(), c.1 + h - 4.0), 0.0, 1.0, 3.0);
    view! {
        <rect class="dg-sym" x=n(c.0 - h) y=n(c.1 - h) width=n(2.0 * h) height=n(2.0 * h) />
        <path class="dg-line dg-inner" d=arrow />
        <path class="dg-fill" d=head />
        <path class="dg-thin" d=spring(Pt(c.0 + h, c.1), Pt(c.0 + h + 20.0, c.1), 3, 5.0) />
        <path class="dg-thin" d=polyline(&[Pt(c.0 + h + 3.0, c.1 + 9.0), Pt(c.0 + h + 17.0, c.1 - 8.0)]) />
        <path class="dg-fill" d=arrow_head(Pt(c.0 + h + 18.0, c.1 - 9.0), 1.0, -1.2, 2.2) />
    }
}

/// A working line that lights up when it carries flow.
fn flow_line(name: &'static str, pts: Vec<Pt>, on: Signal<bool>) -> impl IntoView {
    view! {
        <path
            class="dg-line dg-flow"
            class:active=move || on.get()
            data-line=name
            data-active=move || on.get().to_string()
            d=polyline(&pts)
        />
    }
}

/// The directional valve: three squares (extend, centre, retract), ports
/// P T A B on the centre square, springs and solenoids at both ends.
fn directional_valve(extending: Signal<bool>) -> impl IntoView {
    let (x, y, s) = (DCV.0, DCV.1, DCV_SQ);
    let left = x - s;
    let pa = |dx: f64| x + dx;
    view! {
        <g class="dg-dcv" data-testid="dg-dcv" data-state=move || if extending.get() { "extend" } else { "centre" }>
            <rect class="dg-sym dg-pos" class:active=move || extending.get() x=n(left) y=n(y) width=n(s) height=n(s) />
            <rect class="dg-sym" x=n(x) y=n(y) width=n(s) height=n(s) />
            <rect class="dg-sym" x=n(x + s) y=n(y) width=n(s) height=n(s) />
            // Extend: P→A, B→T.
            <path class="dg-line dg-inner" d=polyline(&[Pt(left + 10.0, y + s - 2.0), Pt(left + 10.0, y + 8.0)]) />
            <path class="dg-fill" d=arrow_head(Pt(left + 10.0, y + 3.0), 0.0, -1.0, 3.0) />
            <path class="dg-line dg-inner" d=polyline(&[Pt(left + 30.0, y + 2.0), Pt(left + 30.0, y + s - 8.0)]) />
            <path class="dg-fill" d=arrow_head(Pt(left + 30.0, y + s - 3.0), 0.0, 1.0, 3.0) />
            // Centre: all ports blocked.
            {[(pa(10.0), y + s, -1.0), (pa(30.0), y + s, -1.0), (pa(10.0), y, 1.0), (pa(30.0), y, 1.0)]
                .into_iter()
                .map(|(px, py, dir)| {
                    let e = py + dir * 9.0;
                    view! {
                        <path class="dg-thin" d=format!("{} M{},{} L{},{}", polyline(&[Pt(px, py), Pt(px, e)]), n(px - 5.0), n(e), n(px + 5.0), n(e)) />
                    }
                })
                .collect_view()}
            // Retract: P→B, A→T.
            <path class="dg-line dg-inner" d=polyline(&[Pt(x + s + 10.0, y + s - 2.0), Pt(x + s + 27.0, y + 7.0)]) />
            <path class="dg-fill" d=arrow_head(Pt(x + s + 30.0, y + 3.0), 0.45, -1.0, 3.0) />
            <path class="dg-line dg-inner" d=polyline(&[Pt(x + s + 10.0, y + 2.0), Pt(x + s + 27.0, y + s - 7.0)]) />
            <path class="dg-fill" d=arrow_head(Pt(x + s + 30.0, y + s - 3.0), 0.45, 1.0, 3.0) />
            // Centring springs and solenoids.
            <path class="dg-thin" d=spring(Pt(left, y + 0.5 * s), Pt(left - 14.0, y + 0.5 * s), 2, 5.0) />
            <rect class="dg-sym" x=n(left - 30.0) y=n(y + 0.5 * s - 9.0) width="16" height="18" />
            <path class="dg-thin" d=polyline(&[Pt(left - 30.0, y + 0.5 * s + 9.0), Pt(left - 14.0, y + 0.5 * s - 9.0)]) />
            <path class="dg-thin" d=spring(Pt(x + 2.0 * s, y + 0.5 * s), Pt(x + 2.0 * s + 14.0, y + 0.5 * s), 2, 5.0) />
            <rect class="dg-sym" x=n(x + 2.0 * s + 14.0) y=n(y + 0.5 * s - 9.0) width="16" height="18" />
            <path class="dg-thin" d=polyline(&[Pt(x + 2.0 * s + 14.0, y + 0.5 * s + 9.0), Pt(x + 2.0 * s + 30.0, y + 0.5 * s - 9.0)]) />
            <text class="dg-port" x=n(pa(4.0)) y=n(y + s + 12.0) text-anchor="end">"P"</text>
            <text class="dg-port" x=n(pa(36.0)) y=n(y + s + 12.0)>"T"</text>
            <text class="dg-port" x=n(pa(4.0)) y=n(y - 4.0) text-anchor="end">"A"</text>
            <text class="dg-port" x=n(pa(36.0)) y=n(y - 4.0)>"B"</text>
        </g>
    }
}

/// The whole drawing for one diagram state.
fn drawing(ds: Memo<Option<DiagramState>>) -> impl IntoView {
    let flows = move || ds.with(|d| d.as_ref().map(|d| d.flows).unwrap_or_default());
    let on = move |pick: fn(&Flows) -> bool| Signal::derive(move || pick(&flows()));
    let check_open =
        move || ds.with(|d| d.as_ref().is_some_and(|d| d.check == g::CheckState::Open));
    let check_stuck = move || ds.with(|d| d.as_ref().and_then(|d| d.check_stuck));
    let fr = Signal::derive(move || {
        ds.with(|d| d.as_ref().map_or(0.0, |d| d.unloader_open_fraction))
    });
    let relief_passing =
        move || ds.with(|d| d.as_ref().is_some_and(|d| d.relief_passing));
    let unloader_offset = Signal::derive(move || 8.0 * (1.0 - fr.get()));
    let relief_offset = Signal::derive(move || if relief_passing() { 0.0 } else { 8.0 });
    let ball_y = move || CHECK.1 - 16.0 - if check_open() { 7.0 } else { 0.0 };
    let (bl, bt, br, bb) = BARREL;
    let (lx, sx) = (PUMP_L.0, PUMP_S.0);
    let pump_top = PUMP_L.1 - PUMP_R;
    let tank_y = 564.0;
    let branch_y = 420.0;
    view! {
        // Pilot lines (dashed): the unloader's external pilot from the
        // system side of the check, the relief's internal pilot.
        <path class="dg-pilot" data-line="unloader-pilot" d=polyline(&[PILOT_TAP, Pt(16.0, PILOT_TAP.1), Pt(16.0, UNLOADER.1), Pt(UNLOADER.0 - VALVE_HALF, UNLOADER.1)]) />
        <path class="dg-pilot" data-line="relief-pilot" d=polyline(&[Pt(RELIEF.0, 280.0), Pt(RELIEF.0 - 35.0, 280.0), Pt(RELIEF.0 - 35.0, RELIEF.1), Pt(RELIEF.0 - VALVE_HALF, RELIEF.1)]) />
        // Working lines.
        {flow_line("large-outlet", vec![Pt(lx, pump_top), Pt(lx, branch_y)], on(|f| f.large_outlet))}
        {flow_line("large-to-check", vec![Pt(lx, branch_y), Pt(lx, CHECK.1)], on(|f| f.through_check))}
        {flow_line("check-to-system", vec![Pt(lx, CHECK.1 - 24.0), Pt(lx, BUS_Y), Pt(sx, BUS_Y)], on(|f| f.through_check))}
        {flow_line("unloader", vec![Pt(lx, branch_y), Pt(UNLOADER.0, branch_y), Pt(UNLOADER.0, UNLOADER.1 - VALVE_HALF)], on(|f| f.through_unloader))}
        {flow_line("unloader-tank", vec![Pt(UNLOADER.0, UNLOADER.1 + VALVE_HALF), Pt(UNLOADER.0, tank_y)], on(|f| f.through_unloader))}
        {flow_line("small", vec![Pt(sx, pump_top), Pt(sx, BUS_Y)], on(|f| f.small))}
        {flow_line("relief", vec![Pt(sx, BUS_Y), Pt(RELIEF.0, BUS_Y), Pt(RELIEF.0, RELIEF.1 - VALVE_HALF)], on(|f| f.through_relief))}
        {flow_line("relief-tank", vec![Pt(RELIEF.0, RELIEF.1 + VALVE_HALF), Pt(RELIEF.0, 372.0)], on(|f| f.through_relief))}
        {flow_line("pressure", vec![Pt(sx, BUS_Y), Pt(sx, DCV.1 + DCV_SQ)], on(|f| f.cylinder))}
        {flow_line("cap", vec![Pt(DCV.0 + 10.0, DCV.1), Pt(DCV.0 + 10.0, 135.0), Pt(195.0, 135.0), Pt(195.0, bb)], on(|f| f.cylinder))}
        {flow_line("rod", vec![Pt(DCV.0 + 30.0, DCV.1), Pt(DCV.0 + 30.0, 145.0), Pt(325.0, 145.0), Pt(325.0, bb)], on(|f| f.cylinder))}
        {flow_line("return", vec![Pt(DCV.0 + 30.0, DCV.1 + DCV_SQ), Pt(DCV.0 + 30.0, RETURN_Y), Pt(455.0, RETURN_Y), Pt(455.0, 236.0)], on(|f| f.cylinder))}
        <path class="dg-line" d=polyline(&[Pt(lx, PUMP_L.1 + PUMP_R), Pt(lx, tank_y)]) />
        <path class="dg-line" d=polyline(&[Pt(sx, PUMP_S.1 + PUMP_R), Pt(sx, tank_y)]) />
        // Tanks.
        {[Pt(lx, tank_y), Pt(sx, tank_y), Pt(UNLOADER.0, tank_y), Pt(RELIEF.0, 372.0), Pt(455.0, 236.0)]
            .into_iter()
            .map(|p| view! { <path class="dg-sym dg-tank" d=tank(p) /> })
            .collect_view()}
        // Junction dots.
        {[Pt(lx, branch_y), Pt(lx, G2.1), PILOT_TAP, Pt(sx, BUS_Y), Pt(sx, G1.1), Pt(UNLOADER.0, G3.1), Pt(RELIEF.0, 280.0)]
            .into_iter()
            .map(|p| view! { <circle class="dg-dot" cx=n(p.0) cy=n(p.1) r="3" /> })
            .collect_view()}
        // Motor and double pump on one shaft, framed as one unit.
        <rect class="dg-frame" x="118" y="490" width="164" height="62" />
        <path class="dg-thin" d=format!("{} {}", polyline(&[Pt(sx + PUMP_R, PUMP_S.1 - 3.0), Pt(MOTOR.0 - 18.0, MOTOR.1 - 3.0)]), polyline(&[Pt(sx + PUMP_R, PUMP_S.1 + 3.0), Pt(MOTOR.0 - 18.0, MOTOR.1 + 3.0)])) />
        <path class="dg-thin" d=format!("{} {}", polyline(&[Pt(lx + PUMP_R, PUMP_L.1 - 3.0), Pt(sx - PUMP_R, PUMP_S.1 - 3.0)]), polyline(&[Pt(lx + PUMP_R, PUMP_L.1 + 3.0), Pt(sx - PUMP_R, PUMP_S.1 + 3.0)])) />
        <g class="dg-motor" data-testid="dg-motor">
            <circle class="dg-sym" cx=n(MOTOR.0) cy=n(MOTOR.1) r="18" />
            <text class="dg-big" x=n(MOTOR.0) y=n(MOTOR.1 + 5.0) text-anchor="middle">"M"</text>
        </g>
        <g
            class="dg-pump"
            data-testid="dg-large-pump"
            data-delivers=move || ds.with(|d| d.as_ref().map_or("system", |d| d.large_delivers))
        >
            <circle class="dg-sym" cx=n(lx) cy=n(PUMP_L.1) r=n(PUMP_R) />
            <path class="dg-fill" d=triangle_up(Pt(lx, pump_top), 6.0) />
        </g>
        <g class="dg-pump" data-testid="dg-small-pump">
            <circle class="dg-sym" cx=n(sx) cy=n(PUMP_S.1) r=n(PUMP_R) />
            <path class="dg-fill" d=triangle_up(Pt(sx, pump_top), 6.0) />
        </g>
        // Check valve: ball in a V seat, spring on the ball.
        <g
            class="dg-check"
            class:open=check_open
            data-testid="dg-check"
            class:stuck=move || check_stuck().is_some()
            data-state=move || {
                check_stuck().unwrap_or(if check_open() { "open" } else { "closed" })
            }
            data-leaking=move || ds.with(|d| d.as_ref().is_some_and(|d| d.check_leaking)).to_string()
        >
            <path class="dg-sym" d=polyline(&[Pt(CHECK.0 - 11.0, CHECK.1 - 14.0), Pt(CHECK.0, CHECK.1), Pt(CHECK.0 + 11.0, CHECK.1 - 14.0)]) />
            <circle class="dg-sym dg-ball" cx=n(CHECK.0) cy=move || n(ball_y()) r="7" />
            <path class="dg-thin" d=move || spring(Pt(CHECK.0 + 4.0, ball_y() - 6.0), Pt(CHECK.0 + 14.0, ball_y() - 18.0), 2, 3.0) />
            // A simulated stuck check: a cross through the ball (its label
            // says which way).
            {move || {
                check_stuck()
                    .map(|_| {
                        let by = ball_y();
                        view! {
                            <g class="dg-stuck-mark" data-testid="dg-check-stuck">
                                <path d=polyline(&[Pt(CHECK.0 - 10.0, by - 10.0), Pt(CHECK.0 + 10.0, by + 10.0)]) />
                                <path d=polyline(&[Pt(CHECK.0 + 10.0, by - 10.0), Pt(CHECK.0 - 10.0, by + 10.0)]) />
                            </g>
                        }
                    })
            }}
        </g>
        // Unloading valve (external pilot) and relief valve (internal pilot).
        <g
            class="dg-unloader"
            data-testid="dg-unloader"
            data-state=move || ds.with(|d| d.as_ref().map_or("shut", |d| d.unloader.code()))
            data-open-fraction=move || format!("{:.3}", fr.get())
        >
            {pressure_valve(UNLOADER, unloader_offset)}
        </g>
        <g
            class="dg-relief"
            class:passing=relief_passing
            data-testid="dg-relief"
            data-state=move || if relief_passing() { "passing" } else { "closed" }
        >
            {pressure_valve(RELIEF, relief_offset)}
        </g>
        {gauge(G1, Pt(PUMP_S.0, G1.1), "G1")}
        {gauge(G2, Pt(PUMP_L.0, G2.1), "G2")}
        {gauge(G3, Pt(UNLOADER.0, G3.1), "G3")}
        {directional_valve(on(|f| f.cylinder))}
        // Double-acting cylinder, single rod.
        <g class="dg-cylinder" data-testid="dg-cylinder" data-state=move || if flows().cylinder { "extending" } else { "stopped" }>
            <rect class="dg-sym" x=n(bl) y=n(bt) width=n(br - bl) height=n(bb - bt) />
            <path class="dg-piston" d=polyline(&[Pt(240.0, bt), Pt(240.0, bb)]) />
            <rect class="dg-sym dg-rod" x="242" y=n(0.5 * (bt + bb) - 4.0) width="170" height="8" />
        </g>
        // Identification codes (ISO 1219-2 style).
        {[
            (MOTOR.0, MOTOR.1 + 34.0, "middle", "0M1"),
            (lx, 592.0, "middle", "0P1 large"),
            (sx, 592.0, "middle", "0P2 small"),
            (CHECK.0 - 14.0, CHECK.1 - 8.0, "end", "0V1"),
            (UNLOADER.0 - VALVE_HALF - 4.0, UNLOADER.1 + 32.0, "end", "0V2"),
            (RELIEF.0 + VALVE_HALF + 4.0, RELIEF.1 + 30.0, "start", "0V3"),
            (DCV.0 - 74.0, DCV.1 + 24.0, "end", "1V1"),
            (bl - 6.0, bt + 24.0, "end", "1A1"),
        ]
            .into_iter()
            .map(|(x, y, a, t)| view! { <text class="dg-code" x=n(x) y=n(y) text-anchor=a>{t}</text> })
            .collect_view()}
        // Live annotations.
        {move || {
            ds.with(|d| {
                d.as_ref()
                    .map(|d| {
                        d.labels
                            .iter()
                            .map(|l| {
                                view! {
                                    <text
                                        class=format!("dg-label {}", l.class)
                                        data-label=l.id
                                        x=n(l.x)
                                        y=n(l.y)
                                        text-anchor=l.anchor
                                    >
                                        {l.text.clone()}
                                    </text>
                                }
                            })
                            .collect_view()
                    })
            })
        }}
    }
}

/// The circuit diagram at `pressure` (Pa; `None`: the pressing point).
#[component]
pub fn CircuitDiagram(
    /// The system pressure to show (a chosen phase's), or `None` for the
    /// pressing point. Without this prop the chart cursor's pressure is
    /// shown, else the pressing point.
    #[prop(optional, into)]
    pressure: Option<Signal<Option<f64>>>,
    /// Stable name for tests (`diagram-<id>`).
    #[prop(default = "main")]
    id: &'static str,
) -> impl IntoView {
    let st = expect_context::<AppState>();
    let pressure = pressure.unwrap_or_else(|| {
        let cursor = use_context::<Cursor>();
        Signal::derive(move || cursor.and_then(|c| c.0.get()))
    });
    let circuit = st.circuit;
    let ds = Memo::new(move |_| {
        let units = st.units.get();
        let cursor = pressure.get();
        circuit.with(|c| {
            let c = c.as_ref()?;
            let p = st
                .shown
                .with(|g| shown_pressure(cursor, c, g.as_ref().map(|g| &g.report)));
            component_states(c, p)
                .ok()
                .map(|s| diagram_state(&s, units))
        })
    });
    let faults_on = move || {
        st.shown
            .with(|g| g.as_ref().is_some_and(|g| !g.design.faults.is_empty()))
    };
    let caption = move || {
        ds.with(|d| {
            d.as_ref().map_or_else(
                || "No result yet: fix the marked inputs.".to_string(),
                |d| d.words[0].clone(),
            )
        })
    };
    view! {
        <figure class="diagram" data-testid=format!("diagram-{id}")>
            <figcaption>
                "Circuit (ISO 1219 symbols) at "
                <span data-testid=format!("diagram-{id}-caption")>{caption}</span>
                {move || faults_on().then(|| view! { <span class="badge fault-badge">"simulated faults"</span> })}
            </figcaption>
            <svg
                class="diagram-svg"
                viewBox=format!("0 0 {} {}", g::W, g::H)
                role="img"
                aria-label="Hi-lo circuit diagram: motor, double pump, check valve, unloading valve with external pilot, relief valve, directional valve and cylinder, with the state at the pressure shown."
                data-testid=format!("diagram-{id}-svg")
                data-pressure-pa=move || ds.with(|d| d.as_ref().map(|d| d.pressure_pa.to_string()))
            >
                {drawing(ds)}
            </svg>
            <ul class="diagram-words" aria-label="What each part does">
                {move || {
                    ds.with(|d| {
                        d.as_ref()
                            .map(|d| {
                                d.words[1..]
                                    .iter()
                                    .map(|w| view! { <li>{w.clone()}</li> })
                                    .collect_view()
                            })
                    })
                }}
            </ul>
        </figure>
    }
}
