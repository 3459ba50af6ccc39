//! Chart geometry: from a report to pixel positions, ticks, paths and
//! labels, in display units. The views only draw what this computes.
//! Pure, no web crates, unit-tested natively.
//!
//! Both charts share one pressure axis (zero to relief full flow), so the
//! power chart lines up under the staircase.

use kneepoint_engine::curves::{CurvePoint, KneeKind};
use kneepoint_engine::units::{format, from_display, to_display, unit};
use kneepoint_engine::{Motion, Quantity, Regime, Report, UnitSystem};

use crate::fmt::{fixed, step_decimals};
use crate::ticks::{nice_axis, nice_step, ticks_within};

/// Width of one character of chart text (px), a generous estimate for the
/// 12 px system sans-serif used in the charts.
pub const CHAR_W: f64 = 6.8;
/// Height of a label line (px).
pub const LINE_H: f64 = 14.0;

/// The drawing and its plot area (px).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Frame {
    /// Whole drawing width.
    pub width: f64,
    /// Whole drawing height.
    pub height: f64,
    /// Left edge of the plot area.
    pub left: f64,
    /// Right edge of the plot area.
    pub right: f64,
    /// Top edge of the plot area.
    pub top: f64,
    /// Bottom edge of the plot area.
    pub bottom: f64,
}

impl Frame {
    /// A frame of `width` px with room for axis labels on both sides.
    pub fn new(width: f64) -> Frame {
        let width = if width.is_finite() {
            width.clamp(300.0, 1200.0)
        } else {
            640.0
        };
        let height = (width * 0.56).clamp(230.0, 400.0);
        Frame {
            width,
            height,
            left: 52.0,
            right: width - 52.0,
            top: 30.0,
            bottom: height - 42.0,
        }
    }
    /// A chart too narrow for full labels: markers carry numbers and the
    /// key below the chart says what they are.
    pub fn compact(&self) -> bool {
        self.width < 560.0
    }
    /// True when (x, y) lies in the plot area.
    pub fn contains(&self, x: f64, y: f64) -> bool {
        (self.left - 0.5..=self.right + 0.5).contains(&x)
            && (self.top - 0.5..=self.bottom + 0.5).contains(&y)
    }
}

/// A linear map from a value (SI) to a pixel position.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Scale {
    /// Domain start (SI).
    pub d0: f64,
    /// Domain end (SI).
    pub d1: f64,
    /// Pixel at `d0`.
    pub r0: f64,
    /// Pixel at `d1`.
    pub r1: f64,
}

impl Scale {
    /// Pixel of `v`.
    pub fn map(&self, v: f64) -> f64 {
        let span = self.d1 - self.d0;
        if span == 0.0 {
            return self.r0;
        }
        self.r0 + (v - self.d0) / span * (self.r1 - self.r0)
    }
    /// Value at pixel `px`.
    pub fn invert(&self, px: f64) -> f64 {
        let span = self.r1 - self.r0;
        if span == 0.0 {
            return self.d0;
        }
        self.d0 + (px - self.r0) / span * (self.d1 - self.d0)
    }
}

/// One tick: its pixel position and its label.
#[derive(Clone, Debug, PartialEq)]
pub struct Tick {
    /// Pixel along the axis.
    pub at: f64,
    /// Text.
    pub label: String,
}

/// A shaded pressure band where one regime holds.
#[derive(Clone, Debug, PartialEq)]
pub struct Band {
    /// Left pixel.
    pub x0: f64,
    /// Right pixel.
    pub x1: f64,
    /// Which regime.
    pub regime: Regime,
    /// CSS class of the shade.
    pub class: &'static str,
    /// Label text, empty when the band is too narrow for it.
    pub label: String,
}

/// Which side of its anchor a label's text runs.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Anchor {
    /// Text starts at the label point.
    Start,
    /// Text ends at the label point.
    End,
}

impl Anchor {
    /// SVG `text-anchor` value.
    pub fn svg(self) -> &'static str {
        match self {
            Anchor::Start => "start",
            Anchor::End => "end",
        }
    }
}

/// A marked point with its label.
#[derive(Clone, Debug, PartialEq)]
pub struct Mark {
    /// Stable name: a knee kind (`unloader_starts`, …), a motion
    /// (`approach`, …) or a corner (`low_corner`, `high_corner`).
    pub kind: &'static str,
    /// Marker pixel.
    pub x: f64,
    /// Marker pixel.
    pub y: f64,
    /// System pressure there (Pa).
    pub pressure_pa: f64,
    /// The value marked (SI of the chart's quantity: flow or power).
    pub value_si: f64,
    /// Label drawn beside the marker: the full text, or on a compact
    /// chart its number in the chart's key.
    pub label: String,
    /// The full label, with units (the chart's key lists it).
    pub full: String,
    /// Label baseline point.
    pub lx: f64,
    /// Label baseline point.
    pub ly: f64,
    /// Which way the text runs from (lx, ly).
    pub anchor: Anchor,
}

/// The pressure-flow staircase.
#[derive(Clone, Debug, PartialEq)]
pub struct Staircase {
    /// Drawing and plot area.
    pub frame: Frame,
    /// Pressure (SI) to x.
    pub x: Scale,
    /// Flow (SI) to y.
    pub y: Scale,
    /// Pressure ticks.
    pub x_ticks: Vec<Tick>,
    /// Flow ticks (left).
    pub y_ticks: Vec<Tick>,
    /// Extend-speed ticks (right), placed on the flow scale.
    pub y2_ticks: Vec<Tick>,
    /// Axis titles with units.
    pub x_title: String,
    /// Left axis title.
    pub y_title: String,
    /// Right axis title.
    pub y2_title: String,
    /// The curve.
    pub path: String,
    /// Regime shading.
    pub bands: Vec<Band>,
    /// The four knees.
    pub knees: Vec<Mark>,
    /// Approach, pressing end and retract.
    pub points: Vec<Mark>,
}

/// The shaft power curve.
#[derive(Clone, Debug, PartialEq)]
pub struct PowerChart {
    /// Drawing and plot area.
    pub frame: Frame,
    /// Pressure (SI) to x.
    pub x: Scale,
    /// Power (SI) to y.
    pub y: Scale,
    /// Pressure ticks.
    pub x_ticks: Vec<Tick>,
    /// Power ticks.
    pub y_ticks: Vec<Tick>,
    /// Axis titles.
    pub x_title: String,
    /// Left axis title.
    pub y_title: String,
    /// Hi-lo shaft power.
    pub path: String,
    /// A single fixed pump of the combined displacement.
    pub single_path: String,
    /// The motor rating line: its y pixel and label.
    pub motor: Option<(f64, Mark)>,
    /// Low and high corners.
    pub corners: Vec<Mark>,
    /// The equal-corner unloading pressure, when it lies on the chart: its
    /// line at `x`, its label at the top of the plot.
    pub equal_corner: Option<Mark>,
}

/// What the motor line shows.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum MotorLine {
    /// The design names a motor (W).
    Entered(f64),
    /// None named: the next standard rating above the peak corner (W).
    Recommended(f64),
    /// None named and the peak is above every listed rating.
    None,
}

/// The CSS class of a regime's shade.
pub fn regime_class(r: Regime) -> &'static str {
    match r {
        Regime::BothPumps => "band-both",
        Regime::Unloading => "band-unloading",
        Regime::SmallPump => "band-small",
        Regime::Relieving | Regime::Stalled => "band-relief",
    }
}

/// Stable name of a knee kind (as in the report's JSON).
pub fn knee_name(k: KneeKind) -> &'static str {
    match k {
        KneeKind::UnloaderStarts => "unloader_starts",
        KneeKind::UnloaderOpen => "unloader_open",
        KneeKind::ReliefCracks => "relief_cracks",
        KneeKind::ReliefFullFlow => "relief_full_flow",
    }
}

/// Capitalises the first letter (labels from the engine are lower case).
pub fn capitalise(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_uppercase().collect::<String>() + c.as_str(),
        None => String::new(),
    }
}

fn title(name: &str, q: Quantity, units: UnitSystem) -> String {
    format!("{name} ({})", unit(q, units).symbol)
}

/// The shared pressure axis: its scale and ticks.
fn pressure_axis(report: &Report, units: UnitSystem, f: &Frame) -> (Scale, Vec<Tick>) {
    let p_max = report
        .curves
        .points
        .last()
        .map_or(1.0, |p| p.pressure_pa)
        .max(1.0);
    let shown = to_display(Quantity::Pressure, units, p_max);
    let axis = nice_axis(0.0, shown, if f.width < 450.0 { 4 } else { 6 });
    let x = Scale {
        d0: 0.0,
        d1: from_display(Quantity::Pressure, units, axis.max),
        r0: f.left,
        r1: f.right,
    };
    let dec = step_decimals(axis.step);
    let ticks = axis
        .ticks()
        .into_iter()
        .map(|t| Tick {
            at: x.map(from_display(Quantity::Pressure, units, t)),
            label: fixed(t, dec),
        })
        .collect();
    (x, ticks)
}

/// A value axis from zero that holds `max_si`, and its ticks.
fn value_axis(
    q: Quantity,
    units: UnitSystem,
    max_si: f64,
    f: &Frame,
) -> (Scale, Vec<Tick>) {
    let shown = to_display(q, units, max_si.max(0.0));
    let axis = nice_axis(0.0, shown, if f.height < 280.0 { 4 } else { 5 });
    let y = Scale {
        d0: 0.0,
        d1: from_display(q, units, axis.max),
        r0: f.bottom,
        r1: f.top,
    };
    let dec = step_decimals(axis.step);
    let ticks = axis
        .ticks()
        .into_iter()
        .map(|t| Tick {
            at: y.map(from_display(q, units, t)),
            label: fixed(t, dec),
        })
        .collect();
    (y, ticks)
}

fn path(
    points: &[CurvePoint],
    x: &Scale,
    y: &Scale,
    value: impl Fn(&CurvePoint) -> f64,
) -> String {
    let mut s = String::with_capacity(points.len() * 14);
    for (i, p) in points.iter().enumerate() {
        let v = value(p);
        if !v.is_finite() {
            continue;
        }
        s.push(if i == 0 { 'M' } else { 'L' });
        s.push_str(&fixed(x.map(p.pressure_pa), 1));
        s.push(',');
        s.push_str(&fixed(y.map(v), 1));
    }
    s
}

/// Regime bands from the curve samples. The knees are samples, so each
/// segment between two samples lies in one regime. The engine's regimes
/// with both pumps, the small pump alone and stall hold at single
/// pressures too; "unloader opening" and "relief passing" only strictly
/// between knees. So a segment takes an end's regime when both ends agree
/// or one end is an in-between regime, and otherwise the in-between regime
/// that separates its two ends.
fn segment_regime(a: Regime, b: Regime) -> Regime {
    use Regime::*;
    let between = |r: Regime| matches!(r, Unloading | Relieving);
    if a == b {
        a
    } else if between(b) {
        b
    } else if between(a) {
        a
    } else if a == BothPumps && b == SmallPump {
        Unloading
    } else {
        Relieving
    }
}

fn bands(points: &[CurvePoint], x: &Scale) -> Vec<Band> {
    let mut out: Vec<Band> = Vec::new();
    for w in points.windows(2) {
        let r = match segment_regime(w[0].regime, w[1].regime) {
            Regime::Stalled => Regime::Relieving,
            r => r,
        };
        let (x0, x1) = (x.map(w[0].pressure_pa), x.map(w[1].pressure_pa));
        match out.last_mut() {
            Some(b) if b.regime == r => b.x1 = x1,
            _ => out.push(Band {
                x0,
                x1,
                regime: r,
                class: regime_class(r),
                label: String::new(),
            }),
        }
    }
    for b in &mut out {
        let text = capitalise(b.regime.label());
        if (b.x1 - b.x0) >= text_width(&text) + 8.0 {
            b.label = text;
        } else {
            // A short form where the full label does not fit.
            let short = match b.regime {
                Regime::BothPumps => "Both",
                Regime::SmallPump => "Small",
                Regime::Relieving => "Relief",
                _ => "",
            };
            if !short.is_empty() && (b.x1 - b.x0) >= text_width(short) + 6.0 {
                b.label = short.to_string();
            }
        }
    }
    out
}

/// Estimated width of a label (px).
pub fn text_width(s: &str) -> f64 {
    s.chars().count() as f64 * CHAR_W
}

/// A rectangle (px): x0, y0, x1, y1.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rect(pub f64, pub f64, pub f64, pub f64);

impl Rect {
    /// True when the two overlap.
    pub fn overlaps(&self, o: &Rect) -> bool {
        self.0 < o.2 && o.0 < self.2 && self.1 < o.3 && o.1 < self.3
    }
}

/// The box a label takes.
pub fn label_box(m: &Mark) -> Rect {
    let w = text_width(&m.label);
    let (x0, x1) = match m.anchor {
        Anchor::Start => (m.lx, m.lx + w),
        Anchor::End => (m.lx - w, m.lx),
    };
    Rect(x0, m.ly - LINE_H + 3.0, x1, m.ly + 3.0)
}

/// Places each label near its marker: the first of a list of positions
/// (right-above, left-above, right-below, …) that stays in the plot area
/// and clear of every marker and every label placed before it.
fn place_labels(marks: &mut [Mark], f: &Frame, taken: &mut Vec<Rect>) {
    for m in marks.iter() {
        taken.push(Rect(m.x - 5.0, m.y - 5.0, m.x + 5.0, m.y + 5.0));
    }
    const DY: [f64; 14] = [
        -9.0, 19.0, -25.0, 35.0, -41.0, 51.0, -57.0, 67.0, -73.0, 83.0, -89.0, -105.0,
        -121.0, -137.0,
    ];
    for m in marks.iter_mut() {
        let (mx, my) = (m.x, m.y);
        let mut choice = None;
        'search: for dy in DY {
            let w = text_width(&m.label);
            // Right of the marker, left of it, or slid along to fit.
            let slid =
                (mx - w / 2.0).clamp(f.left + 2.0, (f.right - 2.0 - w).max(f.left + 2.0));
            for (lx, anchor) in [
                (mx + 8.0, Anchor::Start),
                (mx - 8.0, Anchor::End),
                (slid, Anchor::Start),
            ] {
                let mut t = m.clone();
                t.lx = lx;
                t.ly = my + dy;
                t.anchor = anchor;
                // A little air around each label, so "5" and "7" side by
                // side do not read as "57".
                let lb = label_box(&t);
                let b = Rect(lb.0 - 3.0, lb.1, lb.2 + 3.0, lb.3);
                let inside = b.0 >= f.left + 2.0
                    && b.2 <= f.right - 2.0
                    && b.1 >= f.top + 2.0
                    && b.3 <= f.bottom - 2.0;
                if inside && !taken.iter().any(|r| r.overlaps(&b)) {
                    choice = Some(t);
                    break 'search;
                }
            }
        }
        let t = choice.unwrap_or_else(|| {
            // Nothing free: keep it inside the frame, above the marker.
            let mut t = m.clone();
            let w = text_width(&t.label);
            t.anchor = Anchor::Start;
            t.lx = (mx + 8.0).min(f.right - 2.0 - w).max(f.left + 2.0);
            t.ly = (my - 9.0).max(f.top + LINE_H);
            t
        });
        taken.push(label_box(&t));
        *m = t;
    }
}

fn band_label_boxes(bands: &[Band], f: &Frame) -> Vec<Rect> {
    bands
        .iter()
        .filter(|b| !b.label.is_empty())
        .map(|b| {
            let cx = 0.5 * (b.x0 + b.x1);
            let w = text_width(&b.label);
            Rect(
                cx - w / 2.0,
                f.top + 2.0,
                cx + w / 2.0,
                f.top + 4.0 + LINE_H,
            )
        })
        .collect()
}

/// Baseline of band labels (px).
pub fn band_label_y(f: &Frame) -> f64 {
    f.top + LINE_H
}

fn mark(kind: &'static str, x: &Scale, y: &Scale, p: f64, v: f64, label: String) -> Mark {
    Mark {
        kind,
        x: x.map(p),
        y: y.map(v),
        pressure_pa: p,
        value_si: v,
        full: label.clone(),
        label,
        lx: 0.0,
        ly: 0.0,
        anchor: Anchor::Start,
    }
}

/// The staircase for `report` in `units`, `width` px wide.
pub fn staircase(report: &Report, units: UnitSystem, width: f64) -> Staircase {
    let f = Frame::new(width);
    let pts = &report.curves.points;
    let (x, x_ticks) = pressure_axis(report, units, &f);
    let q_max = pts.iter().map(|p| p.flow_m3s).fold(0.0, f64::max).max(1e-9);
    // Head-room above the top step for the band labels.
    let (y, y_ticks) = value_axis(Quantity::Flow, units, q_max * 1.18, &f);
    let area = report.summary.cap_area_m2;
    let v_top = to_display(Quantity::Velocity, units, y.d1 / area);
    let v_step = nice_step(v_top, if f.height < 280.0 { 4 } else { 5 });
    let v_dec = step_decimals(v_step);
    let y2_ticks = ticks_within(0.0, v_top, v_step)
        .into_iter()
        .map(|v| Tick {
            at: y.map(from_display(Quantity::Velocity, units, v) * area),
            label: fixed(v, v_dec),
        })
        .collect();
    let bands = bands(pts, &x);
    let mut knees: Vec<Mark> = report
        .curves
        .knees
        .iter()
        .map(|k| {
            mark(
                knee_name(k.kind),
                &x,
                &y,
                k.pressure_pa,
                k.flow_m3s,
                format!(
                    "{} {}",
                    capitalise(k.kind.label()),
                    format(Quantity::Pressure, units, k.pressure_pa)
                ),
            )
        })
        .collect();
    let mut points: Vec<Mark> = [
        (Motion::Approach, "approach"),
        (Motion::Pressing, "pressing"),
        (Motion::Retract, "retract"),
    ]
    .into_iter()
    .filter_map(|(m, kind)| {
        let p = report.motion(m)?;
        let name = match m {
            Motion::Pressing => "Pressing end",
            _ => kind,
        };
        Some(mark(
            kind,
            &x,
            &y,
            p.pump.pressure_pa,
            p.cylinder_flow_m3s,
            format!(
                "{} {}",
                capitalise(name),
                format(Quantity::Pressure, units, p.pump.pressure_pa)
            ),
        ))
    })
    .collect();
    let mut taken = band_label_boxes(&bands, &f);
    for m in knees.iter().chain(points.iter()) {
        taken.push(Rect(m.x - 5.0, m.y - 5.0, m.x + 5.0, m.y + 5.0));
    }
    if f.compact() {
        for (i, m) in knees.iter_mut().chain(points.iter_mut()).enumerate() {
            m.label = (i + 1).to_string();
        }
    }
    place_labels(&mut knees, &f, &mut taken);
    place_labels(&mut points, &f, &mut taken);
    Staircase {
        frame: f,
        x,
        y,
        x_ticks,
        y_ticks,
        y2_ticks,
        x_title: title("System pressure", Quantity::Pressure, units),
        y_title: title("Flow to cylinder", Quantity::Flow, units),
        y2_title: title("Extend speed", Quantity::Velocity, units),
        path: path(pts, &x, &y, |p| p.flow_m3s),
        bands,
        knees,
        points,
    }
}

/// The power chart for `report` in `units`, `width` px wide.
pub fn power(
    report: &Report,
    units: UnitSystem,
    motor: MotorLine,
    width: f64,
) -> PowerChart {
    let f = Frame::new(width);
    let pts = &report.curves.points;
    let (x, x_ticks) = pressure_axis(report, units, &f);
    let c = &report.corners;
    let motor_w = match motor {
        MotorLine::Entered(w) | MotorLine::Recommended(w) => w,
        MotorLine::None => 0.0,
    };
    let top = pts
        .iter()
        .map(|p| p.shaft_power_w.max(p.single_pump_w))
        .fold(c.low_w.max(c.high_w).max(motor_w), f64::max);
    let (y, y_ticks) = value_axis(Quantity::Power, units, top * 1.08, &f);
    let low_p = report
        .curves
        .knees
        .iter()
        .find(|k| k.kind == KneeKind::UnloaderStarts)
        .map_or(0.0, |k| k.pressure_pa);
    let p_rf = pts.last().map_or(0.0, |p| p.pressure_pa);
    let mut corners = vec![
        mark(
            "low_corner",
            &x,
            &y,
            low_p,
            c.low_w,
            format!("Low corner {}", format(Quantity::Power, units, c.low_w)),
        ),
        mark(
            "high_corner",
            &x,
            &y,
            p_rf,
            c.high_w,
            format!("High corner {}", format(Quantity::Power, units, c.high_w)),
        ),
    ];
    let mut taken = Vec::new();
    let motor = match motor {
        MotorLine::None => None,
        MotorLine::Entered(w) | MotorLine::Recommended(w) => {
            let yy = y.map(w);
            let word = if matches!(motor, MotorLine::Entered(_)) {
                "entered"
            } else {
                "next standard size"
            };
            let label = format!("Motor {} ({word})", format(Quantity::Power, units, w));
            let m = Mark {
                kind: "motor",
                x: f.left + 4.0,
                y: yy,
                pressure_pa: 0.0,
                value_si: w,
                lx: f.left + 6.0,
                ly: (yy - 5.0).max(f.top + LINE_H),
                anchor: Anchor::Start,
                full: label.clone(),
                label,
            };
            taken.push(label_box(&m));
            // The line itself is an obstacle for the corner labels.
            taken.push(Rect(f.left, yy - 2.0, f.right, yy + 2.0));
            Some((yy, m))
        }
    };
    // The equal-corner line's label sits at the top of the plot, clear of
    // the corners' labels.
    let pe = c.equal_corner_unloading_pa;
    let equal_corner = (pe > 0.0 && pe < x.d1).then(|| {
        let xx = x.map(pe);
        let text = format!("Equal corners {}", format(Quantity::Pressure, units, pe));
        let w = text_width(&text);
        let anchor = if xx + 4.0 + w <= f.right {
            Anchor::Start
        } else {
            Anchor::End
        };
        let m = Mark {
            kind: "equal_corner",
            x: xx,
            y: f.top,
            pressure_pa: pe,
            value_si: pe,
            full: text.clone(),
            label: text,
            lx: if anchor == Anchor::Start {
                xx + 4.0
            } else {
                xx - 4.0
            },
            ly: f.top + LINE_H,
            anchor,
        };
        taken.push(label_box(&m));
        m
    });
    place_labels(&mut corners, &f, &mut taken);
    PowerChart {
        frame: f,
        x,
        y,
        x_ticks,
        y_ticks,
        x_title: title("System pressure", Quantity::Pressure, units),
        y_title: title("Shaft power", Quantity::Power, units),
        path: path(pts, &x, &y, |p| p.shaft_power_w),
        single_path: path(pts, &x, &y, |p| p.single_pump_w),
        motor,
        corners,
        equal_corner,
    }
}

/// The curves at one pressure, by straight-line interpolation between the
/// two samples around it (SI).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Reading {
    /// System pressure (Pa).
    pub pressure_pa: f64,
    /// Flow to the cylinder (m³/s).
    pub flow_m3s: f64,
    /// Extend speed (m/s).
    pub speed_ms: f64,
    /// Shaft power (W).
    pub power_w: f64,
    /// Shaft power of a single pump of the combined displacement (W).
    pub single_w: f64,
}

/// Reads the curves at `p` (clamped to the curve's range).
pub fn read_at(points: &[CurvePoint], p: f64) -> Option<Reading> {
    let first = points.first()?;
    let last = points.last()?;
    let p = if p.is_finite() {
        p.clamp(first.pressure_pa, last.pressure_pa)
    } else {
        first.pressure_pa
    };
    let i = points.partition_point(|q| q.pressure_pa < p);
    let (a, b) = if i == 0 {
        (first, first)
    } else if i >= points.len() {
        (last, last)
    } else {
        (&points[i - 1], &points[i])
    };
    let span = b.pressure_pa - a.pressure_pa;
    let t = if span > 0.0 {
        (p - a.pressure_pa) / span
    } else {
        1.0
    };
    let lerp = |u: f64, v: f64| u + t * (v - u);
    Some(Reading {
        pressure_pa: p,
        flow_m3s: lerp(a.flow_m3s, b.flow_m3s),
        speed_ms: lerp(a.extend_speed_ms, b.extend_speed_ms),
        power_w: lerp(a.shaft_power_w, b.shaft_power_w),
        single_w: lerp(a.single_pump_w, b.single_pump_w),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::design::EXAMPLES;
    use kneepoint_engine::evaluate;
    use kneepoint_engine::units::BAR;

    fn reports() -> Vec<Report> {
        EXAMPLES
            .iter()
            .map(|e| evaluate(&(e.build)()).expect("demo designs are valid"))
            .collect()
    }

    #[test]
    fn scale_maps_and_inverts() {
        let s = Scale {
            d0: 0.0,
            d1: 200.0e5,
            r0: 50.0,
            r1: 550.0,
        };
        assert_eq!(s.map(0.0), 50.0);
        assert_eq!(s.map(100.0e5), 300.0);
        assert!((s.invert(300.0) - 100.0e5).abs() < 1e-6);
        let flat = Scale {
            d0: 1.0,
            d1: 1.0,
            r0: 5.0,
            r1: 9.0,
        };
        assert_eq!(flat.map(3.0), 5.0);
    }

    #[test]
    fn knees_sit_at_their_pressures_in_both_units() {
        for r in reports() {
            for units in [UnitSystem::Metric, UnitSystem::Us] {
                let s = staircase(&r, units, 640.0);
                assert_eq!(s.knees.len(), r.curves.knees.len());
                for (m, k) in s.knees.iter().zip(&r.curves.knees) {
                    assert_eq!(m.pressure_pa, k.pressure_pa);
                    assert!((m.x - s.x.map(k.pressure_pa)).abs() < 1e-9);
                    assert!(s.frame.contains(m.x, m.y), "{} at {},{}", m.kind, m.x, m.y);
                }
                // The axis reaches relief full flow.
                let p_rf = r.curves.points.last().unwrap().pressure_pa;
                assert!(s.x.d1 >= p_rf && s.x.map(p_rf) <= s.frame.right + 1e-9);
            }
        }
    }

    #[test]
    fn labels_stay_inside_and_apart() {
        for r in reports() {
            for units in [UnitSystem::Metric, UnitSystem::Us] {
                for width in [340.0, 480.0, 640.0, 900.0] {
                    let s = staircase(&r, units, width);
                    let mut boxes: Vec<Rect> = band_label_boxes(&s.bands, &s.frame);
                    for m in s.knees.iter().chain(&s.points) {
                        let b = label_box(m);
                        assert!(
                            b.0 >= s.frame.left - 1.0 && b.2 <= s.frame.right + 1.0,
                            "{} {width}",
                            m.label
                        );
                        boxes.push(b);
                    }
                    for (i, a) in boxes.iter().enumerate() {
                        for b in &boxes[i + 1..] {
                            assert!(!a.overlaps(b), "{width} {units:?}: {a:?} {b:?}");
                        }
                    }
                }
            }
        }
    }

    #[test]
    fn ticks_are_round_and_in_order() {
        let r = &reports()[0];
        let s = staircase(r, UnitSystem::Metric, 640.0);
        // Workshop press: relief full flow 168 bar → 0, 50, … 200 bar,
        // or 0, 20, … 180 with more ticks.
        let labels: Vec<&str> = s.x_ticks.iter().map(|t| t.label.as_str()).collect();
        assert_eq!(labels.first(), Some(&"0"));
        assert!(s.x_ticks.windows(2).all(|w| w[0].at < w[1].at));
        assert!(
            s.y_ticks.windows(2).all(|w| w[0].at > w[1].at),
            "y grows upward"
        );
        assert!(s.x_title.ends_with("(bar)"));
        let us = staircase(r, UnitSystem::Us, 640.0);
        assert!(us.x_title.ends_with("(psi)") && us.y_title.ends_with("(gpm)"));
        assert!(us.y2_title.ends_with("(in/s)"));
        // Speed ticks lie on the flow scale through the cap area.
        for t in &s.y2_ticks {
            assert!(t.at <= s.frame.bottom + 1e-9 && t.at >= s.frame.top - 1e-9);
        }
    }

    #[test]
    fn bands_follow_the_regimes() {
        let r = &reports()[0];
        let s = staircase(r, UnitSystem::Metric, 640.0);
        let order: Vec<Regime> = s.bands.iter().map(|b| b.regime).collect();
        assert_eq!(
            order,
            vec![
                Regime::BothPumps,
                Regime::Unloading,
                Regime::SmallPump,
                Regime::Relieving
            ]
        );
        // The first band ends at the unloading setting (30 bar).
        assert!((s.bands[0].x1 - s.x.map(30.0 * BAR)).abs() < 1e-6);
        assert!(s.bands.windows(2).all(|w| (w[0].x1 - w[1].x0).abs() < 1e-9));
    }

    #[test]
    fn power_chart_marks_corners_and_motor() {
        let r = &reports()[0];
        let p = power(r, UnitSystem::Metric, MotorLine::Recommended(7500.0), 640.0);
        assert_eq!(p.corners.len(), 2);
        assert_eq!(p.corners[0].value_si, r.corners.low_w);
        assert_eq!(p.corners[1].value_si, r.corners.high_w);
        let (yy, m) = p.motor.as_ref().expect("motor line");
        assert!((yy - p.y.map(7500.0)).abs() < 1e-9);
        assert!(m.label.contains("7.50 kW"), "{}", m.label);
        // The single-pump curve is drawn and ends above the hi-lo one.
        assert!(p.single_path.starts_with('M'));
        let last = r.curves.points.last().unwrap();
        assert!(last.single_pump_w > last.shaft_power_w);
        assert!(p.y.d1 >= last.single_pump_w);
        let none = power(r, UnitSystem::Us, MotorLine::None, 640.0);
        assert!(none.motor.is_none());
        assert!(none.y_title.ends_with("(hp)"));
    }

    #[test]
    fn reading_interpolates_between_samples() {
        let r = &reports()[0];
        let pts = &r.curves.points;
        let a = &pts[3];
        let b = &pts[4];
        let mid = 0.5 * (a.pressure_pa + b.pressure_pa);
        let got = read_at(pts, mid).unwrap();
        assert!((got.flow_m3s - 0.5 * (a.flow_m3s + b.flow_m3s)).abs() < 1e-15);
        assert!((got.power_w - 0.5 * (a.shaft_power_w + b.shaft_power_w)).abs() < 1e-9);
        let at = read_at(pts, a.pressure_pa).unwrap();
        assert_eq!(at.flow_m3s, a.flow_m3s);
        let beyond = read_at(pts, 1e12).unwrap();
        assert_eq!(beyond.pressure_pa, pts.last().unwrap().pressure_pa);
        assert_eq!(read_at(pts, f64::NAN).unwrap().pressure_pa, 0.0);
        assert!(read_at(&[], 1.0).is_none());
    }
}
