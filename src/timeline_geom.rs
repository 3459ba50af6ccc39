//! Geometry of the duty-cycle timeline: from a cycle report to pixel
//! positions, ticks, paths, segment shading and labels, in display units.
//! Two charts share one time axis: piston position and pressure against
//! time, and shaft power against time with the RMS level and the motor
//! rating. Pure, no web crates, unit-tested natively.

use kneepoint_engine::cycle::{CycleReport, Sample, SegmentKind};
use kneepoint_engine::units::{format, from_display, to_display, unit};
use kneepoint_engine::{Quantity, Regime, UnitSystem};

use crate::chart::{capitalise, text_width, Anchor, Frame, Rect, Scale, Tick, LINE_H};
use crate::fmt::{fixed, step_decimals};
use crate::ticks::{nice_axis, nice_step, ticks_within};

/// One segment's time span, shaded and named.
#[derive(Clone, Debug, PartialEq)]
pub struct SegmentBand {
    /// Position of the segment in the profile.
    pub index: usize,
    /// Its kind.
    pub kind: SegmentKind,
    /// Left pixel.
    pub x0: f64,
    /// Right pixel.
    pub x1: f64,
    /// CSS class of the shade.
    pub class: &'static str,
    /// Text that fits above the band: the name, its number, or nothing.
    pub label: String,
    /// The full name with its number ("3 Dwell"), for the tooltip.
    pub title: String,
}

/// A text label placed on a chart.
#[derive(Clone, Debug, PartialEq)]
pub struct Label {
    /// Baseline point.
    pub x: f64,
    /// Baseline point.
    pub y: f64,
    /// Which way the text runs.
    pub anchor: Anchor,
    /// The text, with units.
    pub text: String,
}

impl Label {
    /// The box the label takes (px).
    pub fn rect(&self) -> Rect {
        let w = text_width(&self.text);
        let (x0, x1) = match self.anchor {
            Anchor::Start => (self.x, self.x + w),
            Anchor::End => (self.x - w, self.x),
        };
        Rect(x0, self.y - LINE_H + 3.0, x1, self.y + 3.0)
    }
}

/// A horizontal level line (RMS power, motor rating) with its label.
#[derive(Clone, Debug, PartialEq)]
pub struct Level {
    /// Its y pixel.
    pub y: f64,
    /// The value (SI).
    pub value_si: f64,
    /// Its label.
    pub label: Label,
}

/// Position and pressure against time.
#[derive(Clone, Debug, PartialEq)]
pub struct MotionTimeline {
    /// Drawing and plot area.
    pub frame: Frame,
    /// Time (s) to x.
    pub x: Scale,
    /// Position (m) to y.
    pub y: Scale,
    /// Pressure (Pa) to y, for the right axis.
    pub y2: Scale,
    /// Time ticks.
    pub x_ticks: Vec<Tick>,
    /// Position ticks (left).
    pub y_ticks: Vec<Tick>,
    /// Pressure ticks (right), as pixels on the same plot.
    pub y2_ticks: Vec<Tick>,
    /// Axis titles with units.
    pub x_title: String,
    /// Left axis title.
    pub y_title: String,
    /// Right axis title.
    pub y2_title: String,
    /// Piston position.
    pub position_path: String,
    /// System (pump) pressure.
    pub pressure_path: String,
    /// Pressure in the cylinder's pressurised chamber, where it differs
    /// (held or trapped pressure); empty when it never does.
    pub chamber_path: String,
    /// Segment shading.
    pub bands: Vec<SegmentBand>,
}

/// Shaft power against time.
#[derive(Clone, Debug, PartialEq)]
pub struct PowerTimeline {
    /// Drawing and plot area.
    pub frame: Frame,
    /// Time (s) to x.
    pub x: Scale,
    /// Power (W) to y.
    pub y: Scale,
    /// Time ticks.
    pub x_ticks: Vec<Tick>,
    /// Power ticks.
    pub y_ticks: Vec<Tick>,
    /// Bottom axis title.
    pub x_title: String,
    /// Left axis title.
    pub y_title: String,
    /// Shaft power.
    pub power_path: String,
    /// RMS power over the cycle.
    pub rms: Level,
    /// The motor rating checked, when there is one.
    pub motor: Option<Level>,
    /// Peak marker (x, y px) and its label.
    pub peak: (f64, f64, Label),
    /// Segment shading.
    pub bands: Vec<SegmentBand>,
}

/// The CSS class of a segment kind's shade.
pub fn segment_class(k: SegmentKind) -> &'static str {
    match k {
        SegmentKind::Approach => "seg-approach",
        SegmentKind::Pressing => "seg-pressing",
        SegmentKind::Dwell => "seg-dwell",
        SegmentKind::Decompression => "seg-decompression",
        SegmentKind::Retract => "seg-retract",
        SegmentKind::Idle => "seg-idle",
    }
}

/// A timeline frame `width` px wide: wider than tall, room for two axes.
pub fn frame(width: f64) -> Frame {
    let width = if width.is_finite() {
        width.clamp(300.0, 1200.0)
    } else {
        640.0
    };
    let height = (width * 0.42).clamp(210.0, 320.0);
    Frame {
        width,
        height,
        left: 52.0,
        right: width - 52.0,
        top: 24.0,
        bottom: height - 40.0,
    }
}

fn title(name: &str, q: Quantity, units: UnitSystem) -> String {
    format!("{name} ({})", unit(q, units).symbol)
}

/// An axis of `q` from zero that holds `max_si`, mapped onto `r0..r1`.
fn axis(
    q: Quantity,
    units: UnitSystem,
    max_si: f64,
    r0: f64,
    r1: f64,
    target: usize,
) -> (Scale, Vec<Tick>) {
    let shown = to_display(q, units, max_si.max(0.0));
    let a = nice_axis(0.0, shown, target);
    let s = Scale {
        d0: 0.0,
        d1: from_display(q, units, a.max),
        r0,
        r1,
    };
    let dec = step_decimals(a.step);
    let ticks = a
        .ticks()
        .into_iter()
        .map(|t| Tick {
            at: s.map(from_display(q, units, t)),
            label: fixed(t, dec),
        })
        .collect();
    (s, ticks)
}

/// The time axis ends at the cycle time, so the segments fill the width;
/// its ticks are the round ones within.
fn time_axis(r: &CycleReport, f: &Frame) -> (Scale, Vec<Tick>) {
    let t = r.totals.cycle_time_s.max(1e-3);
    let x = Scale {
        d0: 0.0,
        d1: t,
        r0: f.left,
        r1: f.right,
    };
    let step = nice_step(t, if f.width < 450.0 { 4 } else { 8 });
    let dec = step_decimals(step);
    let ticks = ticks_within(0.0, t, step)
        .into_iter()
        .map(|v| Tick {
            at: x.map(v),
            label: fixed(v, dec),
        })
        .collect();
    (x, ticks)
}

fn path(
    samples: &[Sample],
    x: &Scale,
    y: &Scale,
    value: impl Fn(&Sample) -> f64,
) -> String {
    let mut s = String::with_capacity(samples.len() * 14);
    let mut first = true;
    for p in samples {
        let v = value(p);
        if !(v.is_finite() && p.t_s.is_finite()) {
            continue;
        }
        s.push(if first { 'M' } else { 'L' });
        first = false;
        s.push_str(&fixed(x.map(p.t_s), 1));
        s.push(',');
        s.push_str(&fixed(y.map(v), 1));
    }
    s
}

fn bands(r: &CycleReport, x: &Scale) -> Vec<SegmentBand> {
    r.segments
        .iter()
        .map(|s| {
            let (x0, x1) = (x.map(s.start_s), x.map(s.start_s + s.time_s));
            let name = capitalise(s.label);
            let number = (s.index + 1).to_string();
            let room = x1 - x0;
            let label = if room >= text_width(&name) + 6.0 {
                name.clone()
            } else if room >= text_width(&number) + 4.0 {
                number.clone()
            } else {
                String::new()
            };
            SegmentBand {
                index: s.index,
                kind: s.kind,
                x0,
                x1,
                class: segment_class(s.kind),
                label,
                title: format!("{number} {name}"),
            }
        })
        .collect()
}

/// Baseline of the segment names, in the top margin above the plot (px).
pub fn band_label_y(f: &Frame) -> f64 {
    f.top - 7.0
}

/// Position and pressure against time for `r` in `units`, `width` px wide.
pub fn motion(r: &CycleReport, units: UnitSystem, width: f64) -> MotionTimeline {
    let f = frame(width);
    let (x, x_ticks) = time_axis(r, &f);
    let s = &r.samples;
    let target = if f.height < 260.0 { 4 } else { 5 };
    let x_max = s.iter().map(|p| p.x_m).fold(0.0, f64::max).max(1e-3);
    let (y, y_ticks) = axis(Quantity::Length, units, x_max, f.bottom, f.top, target);
    let p_max = s
        .iter()
        .map(|p| p.p_pa.max(p.chamber_pa))
        .fold(0.0, f64::max)
        .max(1e5);
    let (y2, y2_ticks) = axis(Quantity::Pressure, units, p_max, f.bottom, f.top, target);
    let differs = s
        .iter()
        .any(|p| (p.chamber_pa - p.p_pa).abs() > 1e-3 * p_max);
    MotionTimeline {
        frame: f,
        x,
        y,
        y2,
        x_ticks,
        y_ticks,
        y2_ticks,
        x_title: title("Time", Quantity::Time, units),
        y_title: title("Position", Quantity::Length, units),
        y2_title: title("Pressure", Quantity::Pressure, units),
        position_path: path(s, &x, &y, |p| p.x_m),
        pressure_path: path(s, &x, &y2, |p| p.p_pa),
        chamber_path: if differs {
            path(s, &x, &y2, |p| p.chamber_pa)
        } else {
            String::new()
        },
        bands: bands(r, &x),
    }
}

/// A level line's label at the right end, above the line (below it when
/// `below`), kept inside the plot.
fn level_label(f: &Frame, y: f64, text: String, below: bool) -> Label {
    let ly = if below { y + LINE_H } else { y - 5.0 };
    Label {
        x: f.right - 4.0,
        y: ly.clamp(f.top + LINE_H, f.bottom - 3.0),
        anchor: Anchor::End,
        text,
    }
}

/// Shaft power against time for `r` in `units`, `width` px wide.
pub fn power(r: &CycleReport, units: UnitSystem, width: f64) -> PowerTimeline {
    let f = frame(width);
    let (x, x_ticks) = time_axis(r, &f);
    let s = &r.samples;
    let t = &r.totals;
    let rating = r
        .motor
        .checked_rating_w
        .filter(|w| w.is_finite() && *w > 0.0);
    let sample_peak = s.iter().map(|p| p.power_w).fold(0.0, f64::max);
    let top = sample_peak
        .max(t.peak_power_w)
        .max(rating.unwrap_or(0.0))
        .max(1.0);
    let target = if f.height < 260.0 { 4 } else { 5 };
    let (y, y_ticks) = axis(Quantity::Power, units, top * 1.1, f.bottom, f.top, target);
    let pw = |w| format(Quantity::Power, units, w);
    let motor = rating.map(|w| {
        let yy = y.map(w);
        let word = if r.motor.checked_is_chosen {
            "chosen"
        } else {
            "smallest that passes"
        };
        // A narrow chart has room for the rating only.
        let text = if f.width < 560.0 {
            format!("Motor {}", pw(w))
        } else {
            format!("Motor {} ({word})", pw(w))
        };
        Level {
            y: yy,
            value_si: w,
            label: level_label(&f, yy, text, false),
        }
    });
    let y_rms = y.map(t.rms_power_w);
    // The RMS label goes under its line when the motor label sits close above.
    let crowded = motor
        .as_ref()
        .is_some_and(|m| (m.y - y_rms).abs() < LINE_H + 4.0);
    let rms = Level {
        y: y_rms,
        value_si: t.rms_power_w,
        label: level_label(&f, y_rms, format!("RMS {}", pw(t.rms_power_w)), crowded),
    };
    let peak_at = s
        .iter()
        .max_by(|a, b| a.power_w.total_cmp(&b.power_w))
        .map_or((0.0, t.peak_power_w), |p| (p.t_s, p.power_w));
    let (px, py) = (x.map(peak_at.0), y.map(peak_at.1));
    let text = format!("Peak {}", pw(peak_at.1));
    let w = text_width(&text);
    let mut taken: Vec<Rect> = vec![rms.label.rect()];
    taken.extend(motor.iter().map(|m| m.label.rect()));
    let candidates = [
        (px + 8.0, py - 6.0, Anchor::Start),
        (px - 8.0, py - 6.0, Anchor::End),
        (px + 8.0, py + LINE_H + 4.0, Anchor::Start),
        (px - 8.0, py + LINE_H + 4.0, Anchor::End),
    ];
    let peak = candidates
        .iter()
        .map(|&(lx, ly, anchor)| Label {
            x: lx,
            y: ly,
            anchor,
            text: text.clone(),
        })
        .find(|l| {
            let b = l.rect();
            b.0 >= f.left + 2.0
                && b.2 <= f.right - 2.0
                && b.1 >= f.top
                && b.3 <= f.bottom - 2.0
                && !taken.iter().any(|r| r.overlaps(&b))
        })
        .unwrap_or_else(|| Label {
            x: (px + 8.0).min(f.right - 2.0 - w).max(f.left + 2.0),
            y: (py - 6.0).max(f.top + LINE_H),
            anchor: Anchor::Start,
            text: text.clone(),
        });
    PowerTimeline {
        frame: f,
        x,
        y,
        x_ticks,
        y_ticks,
        x_title: title("Time", Quantity::Time, units),
        y_title: title("Shaft power", Quantity::Power, units),
        power_path: path(s, &x, &y, |p| p.power_w),
        rms,
        motor,
        peak: (px, py, peak),
        bands: bands(r, &x),
    }
}

/// The time series at one moment, by straight-line interpolation between
/// the two samples around it (SI).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TimeReading {
    /// Cycle time (s).
    pub t_s: f64,
    /// Segment under the cursor.
    pub segment: usize,
    /// Its kind.
    pub kind: SegmentKind,
    /// Piston position (m).
    pub x_m: f64,
    /// Piston speed, positive extending (m/s).
    pub v_ms: f64,
    /// System pressure (Pa).
    pub p_pa: f64,
    /// Chamber pressure (Pa).
    pub chamber_pa: f64,
    /// Flow from the power unit (m³/s).
    pub q_m3s: f64,
    /// Shaft power (W).
    pub power_w: f64,
    /// Regime of the nearer sample.
    pub regime: Regime,
}

/// Reads the time series at `t` (clamped to the cycle). `None` when the
/// report has no samples.
pub fn read_at(r: &CycleReport, t: f64) -> Option<TimeReading> {
    let s = &r.samples;
    let (first, last) = (s.first()?, s.last()?);
    let t = if t.is_finite() { t } else { first.t_s };
    let t = t.clamp(first.t_s, last.t_s);
    let i = s.partition_point(|p| p.t_s < t).min(s.len() - 1);
    let (a, b) = if i == 0 {
        (&s[0], &s[0])
    } else {
        (&s[i - 1], &s[i])
    };
    let span = b.t_s - a.t_s;
    let w = if span > 0.0 { (t - a.t_s) / span } else { 1.0 };
    let lerp = |u: f64, v: f64| u + w * (v - u);
    let near = if w < 0.5 { a } else { b };
    // The segment whose time span holds t (the later one on a boundary).
    let seg = r
        .segments
        .iter()
        .rev()
        .find(|g| g.start_s <= t && g.time_s > 0.0)
        .or(r.segments.first());
    Some(TimeReading {
        t_s: t,
        segment: seg.map_or(near.segment, |g| g.index),
        kind: seg.map_or(SegmentKind::Idle, |g| g.kind),
        x_m: lerp(a.x_m, b.x_m),
        v_ms: lerp(a.v_ms, b.v_ms),
        p_pa: lerp(a.p_pa, b.p_pa),
        chamber_pa: lerp(a.chamber_pa, b.chamber_pa),
        q_m3s: lerp(a.q_m3s, b.q_m3s),
        power_w: lerp(a.power_w, b.power_w),
        regime: near.regime,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::cycle::evaluate_cycle;
    use kneepoint_engine::{Circuit, Design, EXAMPLES};

    fn reports() -> Vec<CycleReport> {
        EXAMPLES
            .iter()
            .map(|e| {
                let c = Circuit::new(&(e.build)()).expect("demo designs are valid");
                evaluate_cycle(&c).expect("demo cycles run")
            })
            .collect()
    }

    /// Every coordinate of an SVG path, as (x, y) pairs.
    fn coords(d: &str) -> Vec<(f64, f64)> {
        d.split(['M', 'L'])
            .filter(|s| !s.is_empty())
            .map(|p| {
                let (x, y) = p.split_once(',').expect("x,y");
                (x.parse().expect("x"), y.parse().expect("y"))
            })
            .collect()
    }

    fn inside(f: &Frame, (x, y): (f64, f64)) -> bool {
        f.contains(x, y)
    }

    #[test]
    fn bands_tile_the_cycle_in_order() {
        for r in reports() {
            for width in [300.0, 340.0, 640.0, 1000.0] {
                let m = motion(&r, UnitSystem::Metric, width);
                assert_eq!(m.bands.len(), r.segments.len());
                let f = m.frame;
                assert!((m.bands[0].x0 - f.left).abs() < 1e-9);
                for w in m.bands.windows(2) {
                    assert!((w[0].x1 - w[1].x0).abs() < 1e-6, "contiguous");
                    assert!(w[0].x0 <= w[0].x1);
                }
                // The last segment ends at the right edge: the cycle fills the plot.
                let end = m.bands.last().expect("segments").x1;
                assert!((end - f.right).abs() < 1e-6, "{end} vs {}", f.right);
                for b in &m.bands {
                    assert!(text_width(&b.label) <= b.x1 - b.x0, "label fits: {b:?}");
                }
            }
        }
    }

    #[test]
    fn paths_stay_in_the_plot() {
        for r in reports() {
            for units in [UnitSystem::Metric, UnitSystem::Us] {
                for width in [320.0, 700.0] {
                    let m = motion(&r, units, width);
                    let p = power(&r, units, width);
                    for d in [
                        &m.position_path,
                        &m.pressure_path,
                        &m.chamber_path,
                        &p.power_path,
                    ] {
                        for c in coords(d) {
                            assert!(inside(&m.frame, c), "{c:?} outside {:?}", m.frame);
                        }
                    }
                    assert_eq!(coords(&m.position_path).len(), r.samples.len());
                }
            }
        }
    }

    #[test]
    fn time_ticks_are_round_and_inside() {
        for r in reports() {
            for width in [320.0, 900.0] {
                let m = motion(&r, UnitSystem::Metric, width);
                let f = m.frame;
                assert!(
                    m.x_ticks.len() >= 3 && m.x_ticks.len() <= 9,
                    "{:?}",
                    m.x_ticks
                );
                assert_eq!(m.x_ticks[0].label, "0");
                assert!((m.x_ticks[0].at - f.left).abs() < 1e-9);
                let values: Vec<f64> = m
                    .x_ticks
                    .iter()
                    .map(|t| t.label.parse().expect("number"))
                    .collect();
                let step = values[1] - values[0];
                // Steps of 1, 2 or 5 × 10ⁿ s.
                let mant = step / 10f64.powf(step.log10().floor());
                assert!(
                    [1.0, 2.0, 5.0].iter().any(|m| (mant - m).abs() < 1e-9),
                    "{step}"
                );
                for t in &m.x_ticks {
                    assert!(t.at >= f.left - 1e-9 && t.at <= f.right + 1e-9);
                }
                assert!(*values.last().expect("ticks") <= r.totals.cycle_time_s + 1e-9);
            }
        }
    }

    #[test]
    fn axis_titles_carry_units() {
        let r = &reports()[0];
        let m = motion(r, UnitSystem::Metric, 640.0);
        assert_eq!(m.y_title, "Position (mm)");
        assert_eq!(m.y2_title, "Pressure (bar)");
        assert_eq!(m.x_title, "Time (s)");
        let m = motion(r, UnitSystem::Us, 640.0);
        assert_eq!(m.y_title, "Position (in)");
        assert_eq!(m.y2_title, "Pressure (psi)");
        let p = power(r, UnitSystem::Us, 640.0);
        assert_eq!(p.y_title, "Shaft power (hp)");
        assert!(p.rms.label.text.ends_with(" hp"), "{}", p.rms.label.text);
    }

    #[test]
    fn position_axis_holds_the_stroke() {
        // The demo press extends 400 mm (design data): the axis must reach it.
        let d = Design::default();
        let r = &reports()[0];
        let m = motion(r, UnitSystem::Metric, 640.0);
        assert!(m.y.d1 >= d.cylinder.stroke_m * (1.0 - 1e-9), "{}", m.y.d1);
        assert!(m.y.d1 <= 1.5 * d.cylinder.stroke_m);
        let top = coords(&m.position_path)
            .into_iter()
            .map(|c| c.1)
            .fold(f64::INFINITY, f64::min);
        assert!((top - m.y.map(d.cylinder.stroke_m)).abs() < 0.1, "{top}");
    }

    #[test]
    fn power_levels_and_peak() {
        for r in reports() {
            let p = power(&r, UnitSystem::Metric, 640.0);
            let f = p.frame;
            // RMS sits at or below the peak; both in the plot.
            assert!(p.rms.y >= p.peak.1 - 1e-6);
            assert!(f.contains(p.peak.0, p.peak.1));
            let mut labels = vec![p.rms.label.clone(), p.peak.2.clone()];
            if let Some(m) = &p.motor {
                assert!(f.contains(f.left, m.y));
                assert_eq!(Some(m.value_si), r.motor.checked_rating_w);
                labels.push(m.label.clone());
            }
            for l in &labels {
                let b = l.rect();
                assert!(b.0 >= f.left - 1e-6 && b.2 <= f.right + 1e-6, "{l:?}");
            }
            // The peak label stays clear of the level labels.
            assert!(!labels[1].rect().overlaps(&labels[0].rect()), "{labels:?}");
        }
    }

    #[test]
    fn reading_at_sample_times_gives_the_sample() {
        let r = &reports()[0];
        for s in r.samples.iter().step_by(17) {
            let g = read_at(r, s.t_s).expect("samples");
            assert!((g.t_s - s.t_s).abs() < 1e-12);
            // At a time shared by two samples (a step) either value is fine.
            let twins: Vec<&Sample> =
                r.samples.iter().filter(|x| x.t_s == s.t_s).collect();
            assert!(
                twins
                    .iter()
                    .any(|x| (x.p_pa - g.p_pa).abs() <= 1e-6 * x.p_pa.max(1.0)),
                "{g:?}"
            );
        }
    }

    #[test]
    fn reading_mid_segment_names_that_segment() {
        let r = &reports()[0];
        for g in &r.segments {
            if g.time_s <= 0.0 {
                continue;
            }
            let mid = g.start_s + 0.5 * g.time_s;
            let x = read_at(r, mid).expect("samples");
            assert_eq!(x.segment, g.index);
            assert_eq!(x.kind, g.kind);
            let lo = g.x_start_m.min(g.x_end_m) - 1e-9;
            let hi = g.x_start_m.max(g.x_end_m) + 1e-9;
            assert!((lo..=hi).contains(&x.x_m), "{x:?} in {g:?}");
        }
        // Outside the cycle: clamped to its ends.
        let before = read_at(r, -5.0).expect("samples");
        assert_eq!(before.t_s, r.samples[0].t_s);
        let after = read_at(r, 1e9).expect("samples");
        assert_eq!(after.t_s, r.samples.last().expect("samples").t_s);
        assert!(read_at(r, f64::NAN).is_some());
    }
}
