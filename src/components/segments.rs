//! The load-profile editor: the segments of the duty cycle in order, each
//! with its own inputs and units; add, remove, move up and down. A design
//! without a profile shows the one derived from its loads, and the first
//! edit makes it the design's own.

use kneepoint_engine::cycle::{
    derived_profile, ForcePoint, Hold, PressingForce, Segment, SegmentKind, MAX_SEGMENTS,
    MAX_TABLE_POINTS,
};
use kneepoint_engine::units::format;
use kneepoint_engine::{Design, Quantity};
use leptos::prelude::*;

use crate::chart::capitalise;
use crate::components::cycle_input::{engine_message, CycleNumber};
use crate::state::{AppState, CycleState};

/// The profile that runs: the design's own, or the one derived from its loads.
pub fn profile(d: &Design) -> Vec<Segment> {
    if d.cycle.segments.is_empty() {
        derived_profile(d)
    } else {
        d.cycle.segments.clone()
    }
}

/// Every kind, in the order a cycle usually runs.
const KINDS: [SegmentKind; 6] = [
    SegmentKind::Approach,
    SegmentKind::Pressing,
    SegmentKind::Dwell,
    SegmentKind::Decompression,
    SegmentKind::Retract,
    SegmentKind::Idle,
];

fn kind_code(k: SegmentKind) -> &'static str {
    match k {
        SegmentKind::Approach => "approach",
        SegmentKind::Pressing => "pressing",
        SegmentKind::Dwell => "dwell",
        SegmentKind::Decompression => "decompression",
        SegmentKind::Retract => "retract",
        SegmentKind::Idle => "idle",
    }
}

fn kind_words(k: SegmentKind) -> &'static str {
    match k {
        SegmentKind::Approach => "Approach (rapid extend, both pumps)",
        SegmentKind::Pressing => "Pressing (slow extend against the work)",
        SegmentKind::Dwell => "Dwell (held at pressure)",
        SegmentKind::Decompression => "Decompression (timed release)",
        SegmentKind::Retract => "Retract (rapid return)",
        SegmentKind::Idle => "Idle (valve centred)",
    }
}

/// Piston position after the segments, from fully retracted (m).
fn end_position(segments: &[Segment], stroke: f64) -> f64 {
    segments.iter().fold(0.0_f64, |x, s| match s {
        Segment::Approach { distance_m, .. } | Segment::Pressing { distance_m, .. } => {
            (x + distance_m).min(stroke)
        }
        Segment::Retract { distance_m, .. } => (x - distance_m).max(0.0),
        _ => x,
    })
}

/// A new segment of `kind` that fits after `segments`: extends use the
/// stroke left, a retract goes back to fully retracted, times are typical.
pub fn new_segment(kind: SegmentKind, d: &Design, segments: &[Segment]) -> Segment {
    let stroke = d.cylinder.stroke_m;
    let x = end_position(segments, stroke);
    let room = (stroke - x).max(0.0);
    let travel = |want: f64| if room > 0.0 { want.min(room) } else { want };
    match kind {
        SegmentKind::Approach => Segment::Approach {
            distance_m: travel(room.max(0.05)),
            force_n: d.loads.approach_force_n,
        },
        SegmentKind::Pressing => Segment::Pressing {
            distance_m: travel(0.02),
            force: PressingForce::Constant {
                force_n: d.loads.pressing_force_n,
            },
        },
        SegmentKind::Dwell => Segment::Dwell {
            time_s: 1.0,
            hold: Hold::AtRelief,
        },
        SegmentKind::Decompression => Segment::Decompression { time_s: 0.5 },
        SegmentKind::Retract => Segment::Retract {
            distance_m: if x > 0.0 { x } else { stroke },
            force_n: d.loads.retract_force_n,
        },
        SegmentKind::Idle => Segment::Idle { time_s: 2.0 },
    }
}

/// The same force in another shape: constant F ↔ linear F…F ↔ a table
/// from the start to the end of the travel; going back keeps the end force.
pub fn reshape(f: &PressingForce, shape: &str, distance_m: f64) -> PressingForce {
    let (first, last) = match f {
        PressingForce::Constant { force_n } => (*force_n, *force_n),
        PressingForce::Linear { from_n, to_n } => (*from_n, *to_n),
        PressingForce::Table { points } => (
            points.first().map_or(0.0, |p| p.force_n),
            points.last().map_or(0.0, |p| p.force_n),
        ),
    };
    match shape {
        "constant" => PressingForce::Constant { force_n: last },
        "linear" => PressingForce::Linear {
            from_n: first,
            to_n: last,
        },
        _ => match f {
            PressingForce::Table { .. } => f.clone(),
            _ => PressingForce::Table {
                points: vec![
                    ForcePoint {
                        position_m: 0.0,
                        force_n: first,
                    },
                    ForcePoint {
                        position_m: 0.5 * distance_m,
                        force_n: 0.5 * (first + last),
                    },
                    ForcePoint {
                        position_m: distance_m,
                        force_n: last,
                    },
                ],
            },
        },
    }
}

fn shape_code(f: &PressingForce) -> &'static str {
    match f {
        PressingForce::Constant { .. } => "constant",
        PressingForce::Linear { .. } => "linear",
        PressingForce::Table { .. } => "table",
    }
}

/// What decides which inputs are drawn: kinds, force shapes, table sizes,
/// plus counters so that drafts never outlive a move or a load.
#[derive(Clone, Debug, PartialEq)]
struct Layout {
    rows: Vec<(SegmentKind, &'static str, usize)>,
    version: u64,
    generation: u64,
}

fn layout_of(segments: &[Segment], version: u64, generation: u64) -> Layout {
    Layout {
        rows: segments
            .iter()
            .map(|s| match s {
                Segment::Pressing { force, .. } => (
                    s.kind(),
                    shape_code(force),
                    match force {
                        PressingForce::Table { points } => points.len(),
                        _ => 0,
                    },
                ),
                _ => (s.kind(), "", 0),
            })
            .collect(),
        version,
        generation,
    }
}

/// Editing context for one profile: the state and the layout counter.
#[derive(Clone, Copy)]
struct Editor {
    st: AppState,
    version: RwSignal<u64>,
}

impl Editor {
    /// Changes the profile; a derived profile becomes the design's own first.
    fn edit(&self, f: impl FnOnce(&mut Vec<Segment>)) {
        let derived = self
            .st
            .design
            .with_untracked(|d| d.cycle.segments.is_empty().then(|| derived_profile(d)));
        self.st.rest.update(|d| {
            if let Some(p) = derived {
                if d.cycle.segments.is_empty() {
                    d.cycle.segments = p;
                }
            }
            f(&mut d.cycle.segments);
        });
    }
    /// As [`Editor::edit`], for a change of layout (drafts are dropped).
    fn restructure(&self, f: impl FnOnce(&mut Vec<Segment>)) {
        self.edit(f);
        self.version.update(|v| *v += 1);
    }
    /// Segment `i` of the profile that runs.
    fn read<T>(&self, i: usize, f: impl Fn(&Segment) -> Option<T>) -> Option<T> {
        self.st.design.with(|d| {
            if d.cycle.segments.is_empty() {
                derived_profile(d).get(i).and_then(&f)
            } else {
                d.cycle.segments.get(i).and_then(&f)
            }
        })
    }
}

/// A number of segment `i`: read by `get`, written by `set`; `key` is the
/// path below the segment (`distance_m`, `force.to_n`).
fn seg_number(
    ed: Editor,
    i: usize,
    label: &'static str,
    q: Quantity,
    key: &'static str,
    get: fn(&Segment) -> Option<f64>,
    set: fn(&mut Segment, f64),
) -> impl IntoView {
    let value = Signal::derive(move || ed.read(i, get));
    let on_set = Callback::new(move |v: Option<f64>| {
        if let Some(v) = v {
            ed.edit(|s| {
                if let Some(seg) = s.get_mut(i) {
                    set(seg, v);
                }
            });
        }
    });
    view! {
        <CycleNumber
            label=label
            quantity=q
            path=format!("cycle.segments[{i}].{key}")
            value=value
            on_set=on_set
        />
    }
}

fn distance_of(s: &Segment) -> Option<f64> {
    match s {
        Segment::Approach { distance_m, .. }
        | Segment::Pressing { distance_m, .. }
        | Segment::Retract { distance_m, .. } => Some(*distance_m),
        _ => None,
    }
}

fn set_distance(s: &mut Segment, v: f64) {
    if let Segment::Approach { distance_m, .. }
    | Segment::Pressing { distance_m, .. }
    | Segment::Retract { distance_m, .. } = s
    {
        *distance_m = v;
    }
}

fn force_of(s: &Segment) -> Option<f64> {
    match s {
        Segment::Approach { force_n, .. } | Segment::Retract { force_n, .. } => {
            Some(*force_n)
        }
        Segment::Pressing {
            force: PressingForce::Constant { force_n },
            ..
        } => Some(*force_n),
        _ => None,
    }
}

fn set_force(s: &mut Segment, v: f64) {
    match s {
        Segment::Approach { force_n, .. }
        | Segment::Retract { force_n, .. }
        | Segment::Pressing {
            force: PressingForce::Constant { force_n },
            ..
        } => *force_n = v,
        _ => {}
    }
}

fn time_of(s: &Segment) -> Option<f64> {
    match s {
        Segment::Dwell { time_s, .. }
        | Segment::Decompression { time_s }
        | Segment::Idle { time_s } => Some(*time_s),
        _ => None,
    }
}

fn set_time(s: &mut Segment, v: f64) {
    if let Segment::Dwell { time_s, .. }
    | Segment::Decompression { time_s }
    | Segment::Idle { time_s } = s
    {
        *time_s = v;
    }
}

fn from_of(s: &Segment) -> Option<f64> {
    match s {
        Segment::Pressing {
            force: PressingForce::Linear { from_n, .. },
            ..
        } => Some(*from_n),
        _ => None,
    }
}

fn set_from(s: &mut Segment, v: f64) {
    if let Segment::Pressing {
        force: PressingForce::Linear { from_n, .. },
        ..
    } = s
    {
        *from_n = v;
    }
}

fn to_of(s: &Segment) -> Option<f64> {
    match s {
        Segment::Pressing {
            force: PressingForce::Linear { to_n, .. },
            ..
        } => Some(*to_n),
        _ => None,
    }
}

fn set_to(s: &mut Segment, v: f64) {
    if let Segment::Pressing {
        force: PressingForce::Linear { to_n, .. },
        ..
    } = s
    {
        *to_n = v;
    }
}

/// The cycle's own error (a stall) for segment `i`, in words.
fn cycle_error(st: AppState, i: usize) -> Signal<Option<String>> {
    let cy = expect_context::<CycleState>();
    Signal::derive(move || {
        let u = st.units.get();
        cy.cycle.with(|c| match c {
            Some(Err(e)) if e.segment() == i => Some(e.message(u)),
            _ => None,
        })
    })
}

/// The position-force table of pressing segment `i`.
fn force_table(ed: Editor, i: usize, n: usize) -> impl IntoView {
    let st = ed.st;
    let points_path = format!("cycle.segments[{i}].force.points");
    let table_msg = Memo::new(move |_| engine_message(&st, &points_path));
    let point = move |j: usize| -> Option<(f64, f64)> {
        ed.read(i, |s| match s {
            Segment::Pressing {
                force: PressingForce::Table { points },
                ..
            } => points.get(j).map(|p| (p.position_m, p.force_n)),
            _ => None,
        })
    };
    let update = move |j: usize, f: &dyn Fn(&mut ForcePoint)| {
        ed.edit(|s| {
            if let Some(Segment::Pressing {
                force: PressingForce::Table { points },
                ..
            }) = s.get_mut(i)
            {
                if let Some(p) = points.get_mut(j) {
                    f(p);
                }
            }
        });
    };
    let rows = (0..n)
        .map(|j| {
            let pos = Signal::derive(move || point(j).map(|p| p.0));
            let force = Signal::derive(move || point(j).map(|p| p.1));
            let set_pos = Callback::new(move |v: Option<f64>| {
                if let Some(v) = v {
                    update(j, &|p| p.position_m = v);
                }
            });
            let set_force = Callback::new(move |v: Option<f64>| {
                if let Some(v) = v {
                    update(j, &|p| p.force_n = v);
                }
            });
            let remove = move |_| {
                ed.restructure(|s| {
                    if let Some(Segment::Pressing {
                        force: PressingForce::Table { points },
                        ..
                    }) = s.get_mut(i)
                    {
                        if points.len() > 1 && j < points.len() {
                            points.remove(j);
                        }
                    }
                })
            };
            let last_point = n <= 1;
            view! {
                <li class="point-row" data-testid=format!("point-{i}-{j}")>
                    <CycleNumber
                        label=format!("Point {} at", j + 1)
                        quantity=Quantity::Length
                        path=format!("cycle.segments[{i}].force.points[{j}].position_m")
                        value=pos
                        on_set=set_pos
                    />
                    <CycleNumber
                        label="Force"
                        quantity=Quantity::Force
                        path=format!("cycle.segments[{i}].force.points[{j}].force_n")
                        value=force
                        on_set=set_force
                    />
                    <button
                        type="button"
                        class="icon-button"
                        disabled=last_point
                        aria-label=format!("Remove point {}", j + 1)
                        on:click=remove
                    >
                        "×"
                    </button>
                </li>
            }
        })
        .collect_view();
    let add = move |_| {
        ed.restructure(|s| {
            if let Some(Segment::Pressing {
                distance_m,
                force: PressingForce::Table { points },
            }) = s.get_mut(i)
            {
                if points.len() < MAX_TABLE_POINTS {
                    let last = points
                        .last()
                        .map_or((0.0, 0.0), |p| (p.position_m, p.force_n));
                    let at = if last.0 < *distance_m {
                        0.5 * (last.0 + *distance_m)
                    } else {
                        last.0
                    };
                    points.push(ForcePoint {
                        position_m: at,
                        force_n: last.1,
                    });
                }
            }
        })
    };
    let table_full = n >= MAX_TABLE_POINTS;
    view! {
        <div class="force-table">
            <p class="field-hint">
                "Position from the start of pressing, and the force there. Straight lines join \
                 the points; two points at one position make a step (breakthrough)."
            </p>
            <ol class="points">{rows}</ol>
            <p class="field-msg" data-testid=format!("cmsg-cycle.segments[{i}].force.points")>
                {move || table_msg.get()}
            </p>
            <button type="button" on:click=add disabled=table_full data-testid=format!("add-point-{i}")>
                "Add point"
            </button>
        </div>
    }
}

/// The inputs of pressing segment `i`: travel, force shape and its values.
fn pressing_inputs(ed: Editor, i: usize, shape: &'static str, n: usize) -> impl IntoView {
    let st = ed.st;
    let choose = move |ev| {
        let to = event_target_value(&ev);
        ed.restructure(|s| {
            if let Some(Segment::Pressing { distance_m, force }) = s.get_mut(i) {
                *force = reshape(force, &to, *distance_m);
            }
        });
    };
    let shape_id = format!("c-seg-{i}-shape");
    let values = match shape {
        "constant" => seg_number(
            ed,
            i,
            "Pressing force",
            Quantity::Force,
            "force.force_n",
            force_of,
            set_force,
        )
        .into_any(),
        "linear" => view! {
            {seg_number(ed, i, "Force at start", Quantity::Force, "force.from_n", from_of, set_from)}
            {seg_number(ed, i, "Force at end", Quantity::Force, "force.to_n", to_of, set_to)}
        }
        .into_any(),
        _ => force_table(ed, i, n).into_any(),
    };
    let stall = cycle_error(st, i);
    view! {
        {seg_number(ed, i, "Travel", Quantity::Length, "distance_m", distance_of, set_distance)}
        <div class="field">
            <label class="field-label" for=shape_id.clone()>
                "Force along the travel"
            </label>
            <select id=shape_id class="select" on:change=choose data-testid=format!("shape-{i}")>
                <option value="constant" selected=shape == "constant">
                    "Constant"
                </option>
                <option value="linear" selected=shape == "linear">
                    "Straight line, start to end (spring-like)"
                </option>
                <option value="table" selected=shape == "table">
                    "Table of points"
                </option>
            </select>
        </div>
        {values}
        <p class="field-msg" role="alert" data-testid=format!("stall-{i}")>
            {move || stall.get()}
        </p>
    }
}

/// The hold choice of dwell segment `i`.
fn hold_input(ed: Editor, i: usize) -> impl IntoView {
    let id = format!("c-seg-{i}-hold");
    let now = move || {
        ed.read(i, |s| match s {
            Segment::Dwell { hold, .. } => Some(*hold),
            _ => None,
        })
        .unwrap_or_default()
    };
    let choose = move |ev| {
        let v = event_target_value(&ev);
        let h = if v == "unloaded" {
            Hold::Unloaded
        } else {
            Hold::AtRelief
        };
        ed.edit(|s| {
            if let Some(Segment::Dwell { hold, .. }) = s.get_mut(i) {
                *hold = h;
            }
        });
    };
    view! {
        <div class="field">
            <label class="field-label" for=id.clone()>
                "While held"
            </label>
            <select id=id class="select" on:change=choose data-testid=format!("hold-{i}")>
                <option value="at_relief" selected=move || now() == Hold::AtRelief>
                    "Valve shifted: small pump over the relief"
                </option>
                <option value="unloaded" selected=move || now() == Hold::Unloaded>
                    "Load held (pilot check), pumps unloaded"
                </option>
            </select>
        </div>
    }
}

/// What segment `i` did in the last cycle that ran, in one line.
fn segment_result(st: AppState, i: usize) -> impl IntoView {
    let cy = expect_context::<CycleState>();
    move || {
        let u = st.units.get();
        cy.cycle_shown.with(|r| {
            let s = r.as_ref()?.segments.get(i)?;
            let mut parts = vec![format!("{} s", crate::fmt::fixed(s.time_s, 2))];
            if s.distance_m > 0.0 {
                parts.push(format!(
                    "mean {}",
                    format(Quantity::Velocity, u, s.mean_speed_ms)
                ));
            }
            parts.push(format!(
                "up to {}",
                format(Quantity::Pressure, u, s.pressure_max_pa)
            ));
            parts.push(format!(
                "peak {}",
                format(Quantity::Power, u, s.peak_power_w)
            ));
            parts.push(format!("{} in", format(Quantity::Energy, u, s.energy_in_j)));
            Some(view! {
                <p
                    class="seg-result"
                    data-testid=format!("seg-result-{i}")
                    data-time-s=s.time_s.to_string()
                    data-peak-w=s.peak_power_w.to_string()
                >
                    {parts.join(" · ")}
                </p>
            })
        })
    }
}

/// One segment's card: header with its number, kind and moves; its inputs;
/// its result.
fn segment_card(
    ed: Editor,
    i: usize,
    count: usize,
    row: (SegmentKind, &'static str, usize),
) -> impl IntoView {
    let (kind, shape, n) = row;
    let n_label = i + 1;
    let name = capitalise(kind_code(kind));
    let up = move |_: leptos::ev::MouseEvent| {
        ed.restructure(|s| {
            if i > 0 && i < s.len() {
                s.swap(i - 1, i);
            }
        })
    };
    let down = move |_: leptos::ev::MouseEvent| {
        ed.restructure(|s| {
            if i + 1 < s.len() {
                s.swap(i, i + 1);
            }
        })
    };
    let remove = move |_: leptos::ev::MouseEvent| {
        ed.restructure(|s| {
            if s.len() > 1 && i < s.len() {
                s.remove(i);
            }
        })
    };
    let (first, last, only) = (i == 0, i + 1 >= count, count <= 1);
    let stall = cycle_error(ed.st, i);
    let body = match kind {
        SegmentKind::Approach | SegmentKind::Retract => view! {
            {seg_number(ed, i, "Travel", Quantity::Length, "distance_m", distance_of, set_distance)}
            {seg_number(ed, i, "Load force", Quantity::Force, "force_n", force_of, set_force)}
            <p class="field-msg" role="alert" data-testid=format!("stall-{i}")>
                {move || stall.get()}
            </p>
        }
        .into_any(),
        SegmentKind::Pressing => pressing_inputs(ed, i, shape, n).into_any(),
        SegmentKind::Dwell => view! {
            {seg_number(ed, i, "Hold time", Quantity::Time, "time_s", time_of, set_time)}
            {hold_input(ed, i)}
        }
        .into_any(),
        SegmentKind::Decompression => {
            seg_number(ed, i, "Release time", Quantity::Time, "time_s", time_of, set_time).into_any()
        }
        SegmentKind::Idle => {
            seg_number(ed, i, "Idle time", Quantity::Time, "time_s", time_of, set_time).into_any()
        }
    };
    view! {
        <li class=format!("segment {}", crate::timeline_geom::segment_class(kind)) data-testid=format!("segment-{i}") data-kind=kind_code(kind)>
            <div class="segment-head">
                <h3>
                    <span class="seg-number">{n_label}</span>
                    {name.clone()}
                </h3>
                <div class="row-actions">
                    <button type="button" disabled=first on:click=up aria-label=format!("Move segment {n_label} ({name}) up")>
                        "↑"
                    </button>
                    <button
                        type="button"
                        disabled=last
                        on:click=down
                        aria-label=format!("Move segment {n_label} ({name}) down")
                    >
                        "↓"
                    </button>
                    <button
                        type="button"
                        disabled=only
                        on:click=remove
                        aria-label=format!("Remove segment {n_label} ({name})")
                        data-testid=format!("remove-{i}")
                    >
                        "Remove"
                    </button>
                </div>
            </div>
            <div class="segment-body">{body}</div>
            {segment_result(ed.st, i)}
        </li>
    }
}

/// The whole profile editor.
#[component]
pub fn ProfileEditor() -> impl IntoView {
    let st = expect_context::<AppState>();
    let ed = Editor {
        st,
        version: RwSignal::new(0),
    };
    let layout = Memo::new(move |_| {
        let (v, g) = (ed.version.get(), st.generation.get());
        st.design.with(|d| layout_of(&profile(d), v, g))
    });
    let derived = Memo::new(move |_| st.rest.with(|d| d.cycle.segments.is_empty()));
    let confirm_reset = RwSignal::new(false);
    let adding = RwSignal::new(SegmentKind::Dwell);
    let add = move |_| {
        let k = adding.get_untracked();
        let seg = st.design.with_untracked(|d| new_segment(k, d, &profile(d)));
        ed.restructure(|s| {
            if s.len() < MAX_SEGMENTS {
                s.push(seg);
            }
        });
    };
    let reset = move |_| {
        if confirm_reset.get_untracked() {
            st.rest.update(|d| d.cycle.segments.clear());
            ed.version.update(|v| *v += 1);
            confirm_reset.set(false);
        } else {
            confirm_reset.set(true);
        }
    };
    let list_msg = Memo::new(move |_| engine_message(&st, "cycle.segments"));
    view! {
        <div class="profile" data-testid="profile">
            {move || {
                if derived.get() {
                    view! {
                        <p class="note" data-testid="profile-derived">
                            "Derived from the loads and stroke on the Circuit view. Edit any value \
                             to keep this profile with the design."
                        </p>
                    }
                        .into_any()
                } else {
                    view! {
                        <div class="note-row">
                            <button type="button" on:click=reset data-testid="profile-reset">
                                {move || {
                                    if confirm_reset.get() {
                                        "Discard this profile? Press again"
                                    } else {
                                        "Derive from the loads again"
                                    }
                                }}
                            </button>
                        </div>
                    }
                        .into_any()
                }
            }}
            {move || {
                let l = layout.get();
                let count = l.rows.len();
                view! {
                    <ol class="segments">
                        {l.rows
                            .into_iter()
                            .enumerate()
                            .map(|(i, row)| segment_card(ed, i, count, row))
                            .collect_view()}
                    </ol>
                }
            }}
            <p class="field-msg">{move || list_msg.get()}</p>
            <div class="add-row">
                <label for="c-add-kind" class="field-label">
                    "Add a segment at the end"
                </label>
                <div class="field-row">
                    <select
                        id="c-add-kind"
                        class="select"
                        data-testid="add-kind"
                        on:change=move |ev| {
                            let v = event_target_value(&ev);
                            if let Some(k) = KINDS.iter().copied().find(|k| kind_code(*k) == v) {
                                adding.set(k);
                            }
                        }
                    >
                        {KINDS
                            .iter()
                            .map(|&k| {
                                view! {
                                    <option value=kind_code(k) selected=move || adding.get() == k>
                                        {kind_words(k)}
                                    </option>
                                }
                            })
                            .collect_view()}
                    </select>
                    <button
                        type="button"
                        on:click=add
                        disabled=move || layout.with(|l| l.rows.len() >= MAX_SEGMENTS)
                        data-testid="add-segment"
                    >
                        "Add"
                    </button>
                </div>
            </div>
        </div>
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::Circuit;

    #[test]
    fn new_segments_fit_the_stroke() {
        // Appending a retract to a profile that ends extended closes it, so
        // the design stays valid (checked by the engine's own validation).
        let mut d = Design::default();
        d.cycle.segments.truncate(2); // approach + pressing: fully extended
        let r = new_segment(SegmentKind::Retract, &d, &d.cycle.segments);
        let back = distance_of(&r).expect("a travel");
        assert!((back - d.cylinder.stroke_m).abs() < 1e-12, "{back}");
        d.cycle.segments.push(r);
        let n = d.cycle.segments.len();
        for k in KINDS {
            let s = new_segment(k, &d, &d.cycle.segments);
            let mut e = d.clone();
            e.cycle.segments.push(s);
            match (k, Circuit::new(&e)) {
                (SegmentKind::Retract, Err(errs)) => {
                    // Nothing left to retract: the engine names the new travel.
                    let path = format!("cycle.segments[{n}].distance_m");
                    assert!(errs.0.iter().all(|e| e.path() == path), "{errs}");
                }
                (_, r) => assert!(r.is_ok(), "{k:?} appended is valid"),
            }
        }
    }

    #[test]
    fn reshape_keeps_the_end_forces() {
        let lin = PressingForce::Linear {
            from_n: 2.0e3,
            to_n: 9.0e3,
        };
        let t = reshape(&lin, "table", 0.04);
        let PressingForce::Table { points } = &t else {
            panic!("a table: {t:?}")
        };
        assert_eq!(
            points.first().map(|p| (p.position_m, p.force_n)),
            Some((0.0, 2.0e3))
        );
        assert_eq!(
            points.last().map(|p| (p.position_m, p.force_n)),
            Some((0.04, 9.0e3))
        );
        assert_eq!(reshape(&t, "linear", 0.04), lin);
        assert_eq!(
            reshape(&lin, "constant", 0.04),
            PressingForce::Constant { force_n: 9.0e3 }
        );
        assert_eq!(reshape(&t, "table", 0.04), t, "a table stays as it is");
    }

    #[test]
    fn layout_ignores_values_but_not_shapes() {
        let d = Design::default();
        let a = layout_of(&d.cycle.segments, 0, 0);
        let mut e = d.clone();
        set_distance(&mut e.cycle.segments[0], 0.3);
        assert_eq!(
            layout_of(&e.cycle.segments, 0, 0),
            a,
            "a value edit keeps the inputs"
        );
        if let Segment::Pressing { distance_m, force } = &mut e.cycle.segments[1] {
            *force = reshape(force, "table", *distance_m);
        }
        assert_ne!(layout_of(&e.cycle.segments, 0, 0), a);
        assert_ne!(layout_of(&d.cycle.segments, 1, 0), a, "a move redraws");
    }

    #[test]
    fn end_position_follows_the_travel() {
        let d = Design::default();
        let s = &d.cycle.segments;
        assert!((end_position(&s[..2], d.cylinder.stroke_m) - 0.4).abs() < 1e-12);
        assert!(end_position(s, d.cylinder.stroke_m).abs() < 1e-12);
    }
}
