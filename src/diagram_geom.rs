//! The circuit diagram (ISO 1219-1 symbols, ISO 1219-2 layout: power unit
//! at the bottom, actuator at the top) as data: where each symbol sits, what
//! each component does at one system pressure, which lines carry flow, and
//! the annotations with units. Pure, no web crates; the SVG component only
//! draws what this returns.
//!
//! Symbol rules follow the project brief §12 (from memory of ISO 1219-1:2012
//! and ISO 1219-2:2012, not re-read): filled triangles for hydraulic pumps,
//! ball-and-seat check with a spring, relief and unloading valves as one
//! square with an offset arrow, internal pilot on the relief and an external
//! dashed pilot from the system line on the unloader, a 4/3 valve with ports
//! P T A B (ISO 9461), a double-acting cylinder, open-top tanks, gauges as a
//! circle with a diagonal arrow.

use kneepoint_engine::field::{ComponentStates, LargeDelivery};
use kneepoint_engine::units::format;
use kneepoint_engine::{Circuit, Motion, Quantity, Report, UnitSystem};

/// Drawing width (SVG user units).
pub const W: f64 = 480.0;
/// Drawing height.
pub const H: f64 = 600.0;

/// A point of the drawing.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Pt(pub f64, pub f64);

/// Electric motor centre.
pub const MOTOR: Pt = Pt(330.0, 520.0);
/// Large pump centre.
pub const PUMP_L: Pt = Pt(150.0, 520.0);
/// Small pump centre.
pub const PUMP_S: Pt = Pt(250.0, 520.0);
/// Pump and motor circle radius.
pub const PUMP_R: f64 = 20.0;
/// Height of the system line (the node downstream of the check valve).
pub const BUS_Y: f64 = 250.0;
/// Check valve: the point of its seat (flow enters here from below).
pub const CHECK: Pt = Pt(150.0, 352.0);
/// Unloading valve square centre.
pub const UNLOADER: Pt = Pt(80.0, 470.0);
/// Relief valve square centre.
pub const RELIEF: Pt = Pt(420.0, 330.0);
/// Valve square half-size.
pub const VALVE_HALF: f64 = 18.0;
/// Directional valve: left edge of its centre square, top edge.
pub const DCV: Pt = Pt(240.0, 160.0);
/// One square of the directional valve.
pub const DCV_SQ: f64 = 40.0;
/// Cylinder barrel: left, top, right, bottom.
pub const BARREL: (f64, f64, f64, f64) = (180.0, 70.0, 340.0, 110.0);
/// Gauge points G1 (system), G2 (large-pump outlet), G3 (unloader tank line).
pub const G1: Pt = Pt(282.0, 320.0);
/// See [`G1`].
pub const G2: Pt = Pt(120.0, 392.0);
/// See [`G1`].
pub const G3: Pt = Pt(56.0, 530.0);
/// Gauge circle radius.
pub const GAUGE_R: f64 = 9.0;
/// Where the unloader's external pilot leaves the system side (downstream
/// of the check).
pub const PILOT_TAP: Pt = Pt(150.0, 290.0);
/// Height of the directional valve's tank line.
pub const RETURN_Y: f64 = 222.0;

fn f(v: f64) -> String {
    crate::fmt::trim_zeros(format!("{v:.1}"))
}

/// SVG path text from points: `M x,y L x,y …`.
pub fn polyline(pts: &[Pt]) -> String {
    let mut s = String::new();
    for (i, p) in pts.iter().enumerate() {
        s.push_str(if i == 0 { "M" } else { " L" });
        s.push_str(&format!("{},{}", f(p.0), f(p.1)));
    }
    s
}

/// A spring (zig-zag) from `a` to `b` with `n` teeth of half-width `w`.
pub fn spring(a: Pt, b: Pt, n: usize, w: f64) -> String {
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let len = (dx * dx + dy * dy).sqrt().max(1e-9);
    let (nx, ny) = (-dy / len * w, dx / len * w);
    let mut pts = vec![a];
    let steps = 2 * n.max(1);
    for i in 1..steps {
        let t = i as f64 / steps as f64;
        let side = if i % 2 == 1 { 1.0 } else { -1.0 };
        pts.push(Pt(a.0 + dx * t + side * nx, a.1 + dy * t + side * ny));
    }
    pts.push(b);
    polyline(&pts)
}

/// A tank symbol (open-top rectangle) with its line entering from above at
/// `top` (the middle of the open top).
pub fn tank(top: Pt) -> String {
    let Pt(x, y) = top;
    format!(
        "M{},{} L{},{} L{},{} L{},{}",
        f(x - 12.0),
        f(y),
        f(x - 12.0),
        f(y + 12.0),
        f(x + 12.0),
        f(y + 12.0),
        f(x + 12.0),
        f(y)
    )
}

/// A filled triangle pointing up with its tip at `tip` (a pump outlet).
pub fn triangle_up(tip: Pt, size: f64) -> String {
    let Pt(x, y) = tip;
    format!(
        "M{},{} L{},{} L{},{} Z",
        f(x),
        f(y),
        f(x - size),
        f(y + size * 1.5),
        f(x + size),
        f(y + size * 1.5)
    )
}

/// An arrow head at `tip` pointing along `(dx, dy)`.
pub fn arrow_head(tip: Pt, dx: f64, dy: f64, size: f64) -> String {
    let len = (dx * dx + dy * dy).sqrt().max(1e-9);
    let (ux, uy) = (dx / len, dy / len);
    let (bx, by) = (tip.0 - ux * size * 1.6, tip.1 - uy * size * 1.6);
    format!(
        "M{},{} L{},{} L{},{} Z",
        f(tip.0),
        f(tip.1),
        f(bx - uy * size),
        f(by + ux * size),
        f(bx + uy * size),
        f(by - ux * size)
    )
}

/// What the check valve does.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CheckState {
    /// Passing the large pump's flow to the system.
    Open,
    /// Seated: the system is held apart from the large pump.
    Closed,
}

impl CheckState {
    /// `data-state` value.
    pub fn code(self) -> &'static str {
        match self {
            CheckState::Open => "open",
            CheckState::Closed => "closed",
        }
    }
}

/// What the unloading valve does.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum UnloaderState {
    /// Shut: the large pump delivers to the system.
    Shut,
    /// Part open (within its pressure band).
    Opening,
    /// Fully open: the large pump circulates to tank.
    Open,
}

impl UnloaderState {
    /// `data-state` value.
    pub fn code(self) -> &'static str {
        match self {
            UnloaderState::Shut => "shut",
            UnloaderState::Opening => "opening",
            UnloaderState::Open => "open",
        }
    }
}

/// Which lines carry flow.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub struct Flows {
    /// Large pump outlet up to the unloader branch (whenever it delivers).
    pub large_outlet: bool,
    /// Through the check valve into the system line.
    pub through_check: bool,
    /// Through the unloading valve to tank.
    pub through_unloader: bool,
    /// Small pump to the system line.
    pub small: bool,
    /// Through the relief valve to tank.
    pub through_relief: bool,
    /// Through the directional valve to and from the cylinder.
    pub cylinder: bool,
}

/// A text on the diagram.
#[derive(Clone, Debug, PartialEq)]
pub struct Label {
    /// Stable name (`data-label`), for tests.
    pub id: &'static str,
    /// Anchor point.
    pub x: f64,
    /// Baseline.
    pub y: f64,
    /// `start`, `middle` or `end`.
    pub anchor: &'static str,
    /// The text, with units.
    pub text: String,
    /// Extra CSS class (`state`, `value`).
    pub class: &'static str,
}

/// Approximate width of a label at the diagram's 11 px font.
pub fn label_width(text: &str) -> f64 {
    6.1 * text.chars().count() as f64
}

impl Label {
    /// Its box: left, top, right, bottom.
    pub fn bounds(&self) -> (f64, f64, f64, f64) {
        let w = label_width(&self.text);
        let x0 = match self.anchor {
            "end" => self.x - w,
            "middle" => self.x - 0.5 * w,
            _ => self.x,
        };
        (x0, self.y - 10.0, x0 + w, self.y + 3.0)
    }
}

/// Everything the diagram shows at one system pressure.
#[derive(Clone, Debug, PartialEq)]
pub struct DiagramState {
    /// System pressure (Pa).
    pub pressure_pa: f64,
    /// The check valve.
    pub check: CheckState,
    /// System oil leaks back through the (closed) check valve.
    pub check_leaking: bool,
    /// The check valve is stuck (a simulated fault): `data-state` value
    /// "stuck-open" or "stuck-shut", and a mark on the drawing.
    pub check_stuck: Option<&'static str>,
    /// The unloading valve.
    pub unloader: UnloaderState,
    /// How far it is open, 0 ..= 1.
    pub unloader_open_fraction: f64,
    /// The relief valve passes flow.
    pub relief_passing: bool,
    /// Where the large pump delivers: `system`, `split` or `tank`.
    pub large_delivers: &'static str,
    /// Lines that carry flow.
    pub flows: Flows,
    /// Annotations with units.
    pub labels: Vec<Label>,
    /// One sentence per component, for the list beside the drawing.
    pub words: Vec<String>,
}

/// The pressure the diagram shows: the cursor's if there is one, else the
/// pressing point (else the approach point, else zero), within 0 ..= p_rf.
pub fn shown_pressure(cursor: Option<f64>, c: &Circuit, report: Option<&Report>) -> f64 {
    let p = cursor
        .filter(|p| p.is_finite())
        .or_else(|| {
            let r = report?;
            r.motion(Motion::Pressing)
                .or_else(|| r.motion(Motion::Approach))
                .map(|m| m.pump.pressure_pa)
        })
        .unwrap_or(0.0);
    p.clamp(0.0, c.relief_full_pa())
}

/// The diagram's state from the engine's component states, in `units`.
pub fn diagram_state(s: &ComponentStates, units: UnitSystem) -> DiagramState {
    let p = |v: f64| format(Quantity::Pressure, units, v);
    let q = |v: f64| format(Quantity::Flow, units, v.max(0.0));
    let check = if s.check_open {
        CheckState::Open
    } else {
        CheckState::Closed
    };
    let fr = s.unloader_open_fraction.clamp(0.0, 1.0);
    let unloader = if fr <= 0.0 {
        UnloaderState::Shut
    } else if fr >= 1.0 {
        UnloaderState::Open
    } else {
        UnloaderState::Opening
    };
    let tiny = 1e-9
        * (s.large_to_system_m3s.abs()
            + s.large_to_tank_m3s.abs()
            + s.small_to_system_m3s.abs());
    let flows = Flows {
        large_outlet: s.large_to_system_m3s + s.large_to_tank_m3s > tiny,
        through_check: s.check_open,
        through_unloader: s.large_to_tank_m3s > tiny || fr > 0.0,
        small: s.small_to_system_m3s > tiny,
        through_relief: s.relief_passing,
        cylinder: s.out_flow_m3s > tiny,
    };
    let large_delivers = match s.large_pump {
        LargeDelivery::ToSystem => "system",
        LargeDelivery::Split => "split",
        LargeDelivery::ToTank => "tank",
    };
    let check_leaking = s.check_back_leak_m3s > tiny;
    // The tank-line meter (G3) sees the dumped flow and any back-leak.
    let tank_line = s.large_to_tank_m3s + s.check_back_leak_m3s;
    let net_large = s.large_to_system_m3s - s.check_back_leak_m3s;
    let check_stuck = s.check_stuck.map(|k| match k {
        kneepoint_engine::faults::Stuck::Open => "stuck-open",
        kneepoint_engine::faults::Stuck::Closed => "stuck-shut",
    });
    let check_words = match check {
        // Short to fit beside the symbol: the ball's position shows which
        // way it is stuck, and the words below say so.
        _ if check_stuck.is_some() => "stuck".to_string(),
        CheckState::Open => "open".to_string(),
        CheckState::Closed if check_leaking => "closed, leaking back".to_string(),
        CheckState::Closed => "closed".to_string(),
    };
    let unloader_words = match unloader {
        UnloaderState::Shut => "shut".to_string(),
        UnloaderState::Opening => format!("{:.0} % open", 100.0 * fr),
        UnloaderState::Open => "open".to_string(),
    };
    let relief_words = if s.relief_passing {
        format!("passing {}", q(s.relief_flow_m3s))
    } else {
        "closed".to_string()
    };
    let l = |id, x, y, anchor, text: String, class| Label {
        id,
        x,
        y,
        anchor,
        text,
        class,
    };
    let (bl, bt, br, _) = BARREL;
    let labels = vec![
        l(
            "g1",
            G1.0 + 14.0,
            G1.1 + 4.0,
            "start",
            format!("G1 {}", p(s.pressure_pa)),
            "value",
        ),
        l(
            "g2",
            G2.0 - 14.0,
            G2.1 + 4.0,
            "end",
            format!("G2 {}", p(s.large_outlet_pa)),
            "value",
        ),
        l(
            "g3",
            G3.0 - 13.0,
            G3.1 + 4.0,
            "end",
            "G3".to_string(),
            "tag",
        ),
        l(
            "g3-flow",
            UNLOADER.0 - 4.0,
            G3.1 + 26.0,
            "end",
            q(tank_line),
            "value",
        ),
        l(
            "check",
            CHECK.0 + 14.0,
            CHECK.1 - 14.0,
            "start",
            format!("check {check_words}"),
            "state",
        ),
        l(
            "large-flow",
            CHECK.0 + 14.0,
            CHECK.1 + 2.0,
            "start",
            format!("→ {}", q(net_large)),
            "value",
        ),
        l(
            "unloader",
            24.0,
            330.0,
            "start",
            format!("unloader {unloader_words}"),
            "state",
        ),
        l(
            "small-flow",
            PUMP_S.0 + 10.0,
            BUS_Y + 92.0,
            "start",
            format!("↑ {}", q(s.small_to_system_m3s)),
            "value",
        ),
        l(
            "relief",
            W - 4.0,
            RELIEF.1 + VALVE_HALF + 54.0,
            "end",
            format!(
                "relief {}",
                if s.relief_passing {
                    "passing"
                } else {
                    "closed"
                }
            ),
            "state",
        ),
        l(
            "relief-flow",
            W - 4.0,
            RELIEF.1 + VALVE_HALF + 68.0,
            "end",
            q(s.relief_flow_m3s),
            "value",
        ),
        l(
            "out-flow",
            DCV.0 + DCV_SQ + 56.0,
            DCV.1 + DCV_SQ + 4.0,
            "start",
            format!("to cylinder {}", q(s.out_flow_m3s)),
            "value",
        ),
        l(
            "cylinder",
            0.5 * (bl + br),
            bt - 8.0,
            "middle",
            if s.out_flow_m3s > tiny {
                "extending".to_string()
            } else {
                "stopped (stalled)".to_string()
            },
            "state",
        ),
    ];
    let words = vec![
        format!("System pressure (G1): {}.", p(s.pressure_pa)),
        format!(
            "Large pump: {} to the system, {} to tank; its outlet (G2) at {}.",
            q(net_large),
            q(tank_line),
            p(s.large_outlet_pa)
        ),
        match check_stuck {
            Some("stuck-open") => "Check valve: stuck open (simulated fault); the system drains to tank through the unloader once it opens.".to_string(),
            Some(_) => "Check valve: stuck shut (simulated fault); nothing from the large pump reaches the system, and while the unloader is shut the large pump is dead-headed.".to_string(),
            None => format!("Check valve: {check_words}."),
        },
        format!(
            "Unloading valve: {unloader_words}{}.",
            if unloader == UnloaderState::Shut {
                ""
            } else {
                ", the large pump's flow to tank"
            }
        ),
        format!("Small pump: {} to the system.", q(s.small_to_system_m3s)),
        format!("Relief valve: {relief_words}."),
        format!("To the cylinder: {}.", q(s.out_flow_m3s)),
    ];
    DiagramState {
        pressure_pa: s.pressure_pa,
        check,
        check_leaking,
        check_stuck,
        unloader,
        unloader_open_fraction: fr,
        relief_passing: s.relief_passing,
        large_delivers,
        flows,
        labels,
        words,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use kneepoint_engine::design::EXAMPLES;
    use kneepoint_engine::faults::Stuck;
    use kneepoint_engine::field::component_states;
    use kneepoint_engine::{evaluate, Design};

    fn state(d: &Design, p: f64) -> DiagramState {
        let c = Circuit::new(d).unwrap();
        diagram_state(&component_states(&c, p).unwrap(), UnitSystem::Metric)
    }

    #[test]
    fn check_closes_above_unloading_and_relief_passes_only_above_cracking() {
        // brief §3.2: regime I below p_u (check open, unloader shut),
        // III above p_u + band (check closed, large pump to tank), IV above
        // the relief's cracking pressure.
        for e in EXAMPLES {
            let d = (e.build)();
            let c = Circuit::new(&d).unwrap();
            let (pu, puf) = (c.unloading_pa(), c.unloading_full_pa());
            let (prc, prf) = (c.relief_cracking_pa(), c.relief_full_pa());
            let lo = state(&d, 0.5 * pu);
            assert_eq!(lo.check, CheckState::Open, "{}", e.name);
            assert_eq!(lo.unloader, UnloaderState::Shut);
            assert_eq!(lo.large_delivers, "system");
            assert!(lo.flows.through_check && !lo.flows.through_unloader);
            assert!(!lo.relief_passing && !lo.flows.through_relief);
            let mid = state(&d, 0.5 * (puf + prc));
            assert_eq!(mid.check, CheckState::Closed, "{}", e.name);
            assert_eq!(mid.unloader, UnloaderState::Open);
            assert_eq!(mid.unloader_open_fraction, 1.0);
            assert_eq!(mid.large_delivers, "tank");
            assert!(mid.flows.through_unloader && !mid.flows.through_check);
            assert!(!mid.relief_passing);
            let just_below = state(&d, prc * 0.999);
            assert!(!just_below.relief_passing, "{}", e.name);
            let relieving = state(&d, 0.5 * (prc + prf));
            assert!(relieving.relief_passing && relieving.flows.through_relief);
            assert!(relieving.flows.cylinder);
            let stall = state(&d, prf);
            assert!(stall.relief_passing && !stall.flows.cylinder);
            let band = state(&d, 0.5 * (pu + puf));
            assert_eq!(band.unloader, UnloaderState::Opening);
            assert!((band.unloader_open_fraction - 0.5).abs() < 1e-9);
            assert_eq!(band.large_delivers, "split");
        }
    }

    #[test]
    fn faults_show_on_the_diagram() {
        let base = Design::default();
        let c = Circuit::new(&base).unwrap();
        let p_press = 0.5 * (c.unloading_full_pa() + c.relief_cracking_pa());
        let mut stuck = base.clone();
        stuck.faults.unloader_stuck = Some(Stuck::Open);
        let s = state(&stuck, 0.0);
        assert_eq!(s.unloader, UnloaderState::Open);
        assert_eq!(s.large_delivers, "tank");
        let mut leak = base.clone();
        leak.faults.check_leak_m3s_per_pa = Some(1e-10);
        let s = state(&leak, p_press);
        assert_eq!(s.check, CheckState::Closed);
        assert!(s.check_leaking);
        assert!(s.labels.iter().any(|l| l.text.contains("leaking back")));
        let mut low = base.clone();
        low.faults.relief_scale = Some(0.5);
        let c = Circuit::new(&low).unwrap();
        assert!(state(&low, c.relief_full_pa()).relief_passing);
        assert!(!state(&base, p_press).check_leaking);
        assert_eq!(state(&base, p_press).check_stuck, None);
        // A stuck check: its own state code and words, at any pressure.
        for (how, code, seat) in [
            (Stuck::Open, "stuck-open", CheckState::Open),
            (Stuck::Closed, "stuck-shut", CheckState::Closed),
        ] {
            let mut d = base.clone();
            d.faults.check_stuck = Some(how);
            for p in [0.0, 0.5 * c.unloading_pa()] {
                let s = state(&d, p);
                assert_eq!(s.check_stuck, Some(code));
                assert_eq!(s.check, seat);
                assert!(s.words.iter().any(|w| w.contains("stuck")), "{:?}", s.words);
            }
        }
        // Stuck shut, the large-pump gauge (G2) reads far above the system.
        let mut shut = base.clone();
        shut.faults.check_stuck = Some(Stuck::Closed);
        let p = 0.5 * c.unloading_pa();
        let s = component_states(&Circuit::new(&shut).unwrap(), p).unwrap();
        assert!(s.large_outlet_pa > 2.0 * p);
    }

    #[test]
    fn annotations_carry_units_stay_inside_and_apart() {
        for units in [UnitSystem::Metric, UnitSystem::Us] {
            for (e, stuck) in EXAMPLES.iter().flat_map(|e| {
                [None, Some(Stuck::Open), Some(Stuck::Closed)].map(|s| (e, s))
            }) {
                let mut d = (e.build)();
                d.faults.check_stuck = stuck;
                let c = Circuit::new(&d).unwrap();
                for p in [0.0, c.unloading_pa() * 1.02, c.relief_full_pa()] {
                    let s = diagram_state(&component_states(&c, p).unwrap(), units);
                    let (pu, qu) = match units {
                        UnitSystem::Metric => ("bar", "L/min"),
                        UnitSystem::Us => ("psi", "gpm"),
                    };
                    for l in &s.labels {
                        if l.class == "value" {
                            assert!(
                                l.text.contains(pu) || l.text.contains(qu),
                                "{}",
                                l.text
                            );
                        }
                        let (x0, y0, x1, y1) = l.bounds();
                        assert!(
                            x0 >= 0.0 && x1 <= W && y0 >= 0.0 && y1 <= H,
                            "{} {:?}",
                            l.id,
                            l.bounds()
                        );
                    }
                    for (i, a) in s.labels.iter().enumerate() {
                        for b in &s.labels[i + 1..] {
                            let (a0, a1, a2, a3) = a.bounds();
                            let (b0, b1, b2, b3) = b.bounds();
                            let apart = a2 <= b0 || b2 <= a0 || a3 <= b1 || b3 <= a1;
                            assert!(
                                apart,
                                "{} and {} overlap: {} / {}",
                                a.id, b.id, a.text, b.text
                            );
                        }
                    }
                }
            }
        }
    }

    #[test]
    fn shown_pressure_prefers_the_cursor_then_pressing() {
        let d = Design::default();
        let c = Circuit::new(&d).unwrap();
        let r = evaluate(&d).unwrap();
        let press = r.motion(Motion::Pressing).unwrap().pump.pressure_pa;
        assert_eq!(shown_pressure(None, &c, Some(&r)), press);
        assert_eq!(shown_pressure(Some(12.0e5), &c, Some(&r)), 12.0e5);
        assert_eq!(shown_pressure(Some(1e12), &c, Some(&r)), c.relief_full_pa());
        assert_eq!(shown_pressure(Some(-5.0), &c, None), 0.0);
        assert_eq!(shown_pressure(Some(f64::NAN), &c, None), 0.0);
    }

    #[test]
    fn path_builders() {
        assert_eq!(polyline(&[Pt(0.0, 0.0), Pt(10.0, 5.5)]), "M0,0 L10,5.5");
        let s = spring(Pt(0.0, 0.0), Pt(0.0, 20.0), 2, 4.0);
        assert_eq!(s.matches(" L").count(), 4, "{s}");
        assert!(tank(Pt(50.0, 10.0)).starts_with("M38,10"));
        assert!(triangle_up(Pt(5.0, 5.0), 4.0).ends_with('Z'));
        // Symbols sit inside the drawing.
        for p in [
            MOTOR, PUMP_L, PUMP_S, CHECK, UNLOADER, RELIEF, DCV, G1, G2, G3,
        ] {
            assert!(p.0 > 0.0 && p.0 < W && p.1 > 0.0 && p.1 < H);
        }
    }
}
