//! The quasi-static integrator with oil compressibility (brief §5.2–5.3).
//!
//! # Formula
//! ```text
//! dt = [A·dx + (V/β_e)·dp] / Q_out(p)          V = V_dead + A·x (pressurised side)
//! F(p) = (p − p_req(0, Q_out(p)))·A            force moved at system pressure p
//! ```
//! `p_req` is the steady required pressure of `motion.rs`; it is linear in
//! the force with slope 1/A, so F(p) is its exact inverse and rises with p.
//! Every travel piece with a linear force F(x) is therefore integrated with
//! the pressure as the parameter: x(p) follows from F(p) and dx/dp =
//! F'(p)/F'(x). A pressure rise at a standing piston (dx = 0) is the same
//! integral with dx = 0. Pieces are split where p crosses the unloader start
//! and end and relief cracking, so every panel lies inside one regime of the
//! staircase; in the relief band the parameter is s = −ln(p_rf − p), which
//! removes the 1/(p_rf − p) growth of 1/Q near full flow.
//!
//! Each piece is integrated by composite Simpson's rule, starting with two
//! panels and halving the panels until the piece's time and shaft energy
//! change by less than the relative tolerance between halvings. Every
//! quantity (time, energy in, work, heat by source, stored energy, ∫P²dt)
//! uses the same nodes and weights, and at every node shaft power equals
//! losses plus p·Q and p·Q·dt equals p·A·dx plus p·(V/β)·dp exactly, so the
//! energy balance closes to rounding. Deterministic: the panel counts depend
//! only on the input.

use std::cell::Cell;

use crate::circuit::{Circuit, PumpPoint, Regime};
use crate::cycle::results::{CycleError, HeatBySource, Sample, SegmentResult};
use crate::cycle::spec::{Hold, PressingForce, Segment};
use crate::lines::{RE_LAMINAR, RE_TURBULENT};
use crate::motion::{driving_area, increasing_root, required_pressure, Direction};

/// Options of the integration.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CycleOptions {
    /// Relative change of each piece's time and energy between two halvings
    /// at which the halving stops (default 1e-6).
    pub tolerance: f64,
    /// Most halvings per piece (default 14, i.e. up to 32 768 panels).
    pub max_halvings: u32,
}

impl Default for CycleOptions {
    fn default() -> Self {
        CycleOptions {
            tolerance: 1e-6,
            max_halvings: 14,
        }
    }
}

/// Flow below which the cylinder counts as stalled, as a fraction of the
/// small pump's theoretical flow.
const STALL_FLOW_FRACTION: f64 = 1e-6;
/// A dwell at relief holds the pressure where the power unit's output has
/// fallen to this fraction of the small pump's theoretical flow (the rest
/// of the approach to full flow is asymptotic).
const HOLD_FLOW_FRACTION: f64 = 1e-4;
/// Samples drawn across a decompression.
const DECOMPRESSION_SAMPLES: usize = 8;

const DT: usize = 0;
const EIN: usize = 1;
const WORK: usize = 2;
const RELIEF: usize = 3;
const UNLOAD: usize = 4;
const VALVES: usize = 5;
const PUMPS: usize = 6;
const STORED: usize = 7;
const P2: usize = 8;
const NR: usize = 9;

/// Rates of every integrated quantity per unit parameter, and the state.
#[derive(Clone, Copy, Debug)]
struct Node {
    r: [f64; NR],
    p: f64,
    x: f64,
    /// Signed piston speed, `None` where the piston stands.
    v: Option<f64>,
    q: f64,
    q_ret: f64,
    power: f64,
    torque: f64,
    regime: Regime,
    chamber: f64,
}

/// Oil released from compression (J, m³), for the decompression warning.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) struct Release {
    pub segment: usize,
    /// V·p²/(2β) before release (J), brief §5.4.
    pub energy_j: f64,
    /// V·p/β (m³).
    pub volume_m3: f64,
    /// Released in no time (no decompression segment, or a force drop).
    pub sudden: bool,
}

/// Everything one run produces.
pub(crate) struct RunOutput {
    pub segments: Vec<SegmentResult>,
    pub samples: Vec<Sample>,
    pub releases: Vec<Release>,
    /// First pressing point with the relief passing flow: (segment, x, p).
    pub relief_in_pressing: Option<(usize, f64, f64)>,
    pub supply_flow_max_m3s: f64,
    pub return_flow_max_m3s: f64,
    pub extend_pressure_max_pa: f64,
    pub stored_end_j: f64,
    pub p2t: f64,
    pub panels: u32,
    pub evaluations: u32,
}

#[derive(Default)]
struct SegAcc {
    sums: [f64; NR],
    peak_power: f64,
    peak_torque: f64,
    p_min: f64,
    p_max: f64,
    v_min: Option<f64>,
    v_max: Option<f64>,
    unloading_time: f64,
    relief_time: f64,
    panels: u32,
}

/// One integrated piece: nodes of composite Simpson over [s0, s1].
struct Piece {
    nodes: Vec<Node>,
    s0: f64,
    s1: f64,
}

impl Piece {
    fn panels(&self) -> usize {
        (self.nodes.len() - 1) / 2
    }
    fn sum(&self, k: usize) -> f64 {
        let n = self.panels();
        let h = (self.s1 - self.s0) / n as f64;
        let mut s = 0.0;
        for j in 0..n {
            let a = &self.nodes[2 * j].r[k];
            let b = &self.nodes[2 * j + 1].r[k];
            let c = &self.nodes[2 * j + 2].r[k];
            s += h / 6.0 * (a + 4.0 * b + c);
        }
        s
    }
}

/// Linear travel law of one piece, as seen from the pressure parameter.
#[derive(Clone, Copy)]
struct Law {
    dir: Direction,
    /// Travel from the segment start at the piece's start and end (m).
    d_a: f64,
    d_b: f64,
    /// F(p) at the piece's end pressures (N).
    f_a: f64,
    f_b: f64,
    /// Position at the segment start (m).
    x0: f64,
}

struct Run<'a> {
    c: &'a Circuit,
    opts: CycleOptions,
    beta: f64,
    v_dead: f64,
    stroke: f64,
    p_centre: f64,
    p_rf: f64,
    p_stall: f64,
    p_top: f64,
    p_rc: f64,
    /// Pressures where the staircase changes regime or a hose's friction
    /// law changes (Re = 2300, 4000), per direction, sorted.
    breaks_ext: Vec<f64>,
    breaks_ret: Vec<f64>,
    // State.
    x: f64,
    p_ch: f64,
    side: Option<Direction>,
    stored: f64,
    t: f64,
    // Outputs.
    seg: SegAcc,
    index: usize,
    samples: Vec<Sample>,
    releases: Vec<Release>,
    relief_in_pressing: Option<(usize, f64, f64)>,
    pressing: bool,
    q_sup_max: f64,
    q_ret_max: f64,
    p_ext_max: f64,
    p2t: f64,
    panels: u32,
    evals: Cell<u32>,
}

/// Runs the profile on the circuit.
pub(crate) fn run(
    c: &Circuit,
    segments: &[Segment],
    opts: CycleOptions,
) -> Result<RunOutput, CycleError> {
    let d = c.design();
    let mut r = Run {
        c,
        opts,
        beta: d.oil.bulk_modulus_pa,
        v_dead: d.cycle.dead_volume_m3,
        stroke: d.cylinder.stroke_m,
        p_centre: d.cycle.centre_pressure_pa.min(c.relief_full_pa()),
        p_rf: c.relief_full_pa(),
        p_stall: 0.0,
        p_top: 0.0,
        p_rc: c.relief_cracking_pa(),
        breaks_ext: Vec::new(),
        breaks_ret: Vec::new(),
        x: 0.0,
        p_ch: 0.0,
        side: None,
        stored: 0.0,
        t: 0.0,
        seg: SegAcc::default(),
        index: 0,
        samples: Vec::new(),
        releases: Vec::new(),
        relief_in_pressing: None,
        pressing: false,
        q_sup_max: 0.0,
        q_ret_max: 0.0,
        p_ext_max: 0.0,
        p2t: 0.0,
        panels: 0,
        evals: Cell::new(0),
    };
    let qth_s = c.small_theoretical_flow();
    r.p_stall = r.flow_pressure(STALL_FLOW_FRACTION * qth_s);
    r.p_top = r.flow_pressure(HOLD_FLOW_FRACTION * qth_s);
    r.breaks_ext = r.breakpoints(Direction::Extend);
    r.breaks_ret = r.breakpoints(Direction::Retract);
    let mut out = Vec::with_capacity(segments.len());
    for (i, s) in segments.iter().enumerate() {
        out.push(r.segment(i, s)?);
    }
    Ok(RunOutput {
        segments: out,
        samples: r.samples,
        releases: r.releases,
        relief_in_pressing: r.relief_in_pressing,
        supply_flow_max_m3s: r.q_sup_max,
        return_flow_max_m3s: r.q_ret_max,
        extend_pressure_max_pa: r.p_ext_max,
        stored_end_j: r.stored,
        p2t: r.p2t,
        panels: r.panels,
        evaluations: r.evals.get(),
    })
}

fn sign(dir: Direction) -> f64 {
    match dir {
        Direction::Extend => 1.0,
        Direction::Retract => -1.0,
    }
}

impl Run<'_> {
    fn pump(&self, p: f64) -> PumpPoint {
        self.evals.set(self.evals.get() + 1);
        self.c.pump_point_unchecked(p.clamp(0.0, self.p_rf))
    }

    /// Highest pressure at which the power unit still delivers `q_min`:
    /// the root of q_min − Q_out(p), which does not fall with p.
    fn flow_pressure(&self, q_min: f64) -> f64 {
        let g = |p: f64| q_min - self.pump(p).out_flow_m3s;
        let (g0, g1) = (g(0.0), g(self.p_rf));
        if g0 >= 0.0 {
            return 0.0;
        }
        if g1 < 0.0 {
            return self.p_rf;
        }
        let tol = 1e-12 * self.c.small_theoretical_flow();
        increasing_root((0.0, g0), (self.p_rf, g1), g, |_| tol)
    }

    /// Where a piece must be split in `dir`: the unloader start and end,
    /// relief cracking, and the pressures at which a hose's Reynolds number
    /// crosses 2300 or 4000 (the friction factor has a kink there).
    fn breakpoints(&mut self, dir: Direction) -> Vec<f64> {
        let c = self.c;
        let mut v = vec![
            c.unloading_pa(),
            c.unloading_full_pa(),
            c.relief_cracking_pa(),
        ];
        let ln = &c.design().lines;
        let nu = c.design().oil.viscosity_m2s;
        let phi = c.area_ratio();
        // Supply flow Q at which a hose of bore d is at Reynolds number re.
        let hoses = [
            (ln.pressure_hose.as_ref(), 1.0),
            (
                ln.return_hose.as_ref(),
                match dir {
                    Direction::Extend => phi,
                    Direction::Retract => 1.0 / phi,
                },
            ),
        ];
        let q0 = self.pump(0.0).out_flow_m3s;
        for (h, scale) in hoses {
            let Some(h) = h else { continue };
            for re in [RE_LAMINAR, RE_TURBULENT] {
                let q = scale * re * nu * std::f64::consts::PI * h.bore_m / 4.0;
                if q.is_finite() && q > 0.0 && q < q0 {
                    v.push(self.flow_pressure(q));
                }
            }
        }
        v.retain(|p| p.is_finite() && *p > 0.0 && *p < self.p_rf);
        v.sort_by(f64::total_cmp);
        v.dedup();
        v
    }

    /// Force moved at steady system pressure `p`: (p − p_req(0, Q))·A.
    fn force_at(&self, dir: Direction, p: f64) -> (f64, PumpPoint) {
        let pp = self.pump(p);
        let p0 = required_pressure(self.c, dir, 0.0, pp.out_flow_m3s);
        ((p - p0) * driving_area(self.c, dir), pp)
    }

    /// Steady pressure for `force`, or the largest force when it stalls:
    /// the root of F(p) − F, which rises with p (module docs).
    fn pressure_for(&self, dir: Direction, force: f64) -> Result<f64, f64> {
        let (f_max, _) = self.force_at(dir, self.p_stall);
        if force >= f_max {
            return Err(f_max);
        }
        let g = |p: f64| self.force_at(dir, p).0 - force;
        let g0 = g(0.0);
        if g0 >= 0.0 {
            return Ok(0.0);
        }
        let tol = 1e-13 * f_max.abs().max(1.0);
        Ok(increasing_root(
            (0.0, g0),
            (self.p_stall, f_max - force),
            g,
            |_| tol,
        ))
    }

    /// Pressurised volume at position `x` (m³).
    fn volume(&self, dir: Direction, x: f64) -> f64 {
        let x = x.clamp(0.0, self.stroke);
        match dir {
            Direction::Extend => self.v_dead + self.c.cap_area() * x,
            Direction::Retract => self.v_dead + self.c.annulus_area() * (self.stroke - x),
        }
    }

    fn segment(&mut self, i: usize, s: &Segment) -> Result<SegmentResult, CycleError> {
        self.seg = SegAcc {
            p_min: f64::INFINITY,
            p_max: f64::NEG_INFINITY,
            ..SegAcc::default()
        };
        self.index = i;
        self.pressing = matches!(s, Segment::Pressing { .. });
        let (t0, x0) = (self.t, self.x);
        let distance = match s {
            Segment::Approach {
                distance_m,
                force_n,
            } => {
                self.travel(
                    Direction::Extend,
                    *distance_m,
                    &[(0.0, *distance_m, *force_n, *force_n)],
                )?;
                *distance_m
            }
            Segment::Retract {
                distance_m,
                force_n,
            } => {
                self.travel(
                    Direction::Retract,
                    *distance_m,
                    &[(0.0, *distance_m, *force_n, *force_n)],
                )?;
                *distance_m
            }
            Segment::Pressing { distance_m, force } => {
                let pieces = force_pieces(force, *distance_m);
                self.travel(Direction::Extend, *distance_m, &pieces)?;
                *distance_m
            }
            Segment::Dwell { time_s, hold } => {
                match hold {
                    Hold::AtRelief => self.dwell_at_relief(*time_s)?,
                    Hold::Unloaded => self.centre(*time_s, 1, |_| 1.0),
                }
                0.0
            }
            Segment::Decompression { time_s } => {
                self.decompress(*time_s);
                0.0
            }
            Segment::Idle { time_s } => {
                self.release_all(true);
                self.side = None;
                self.centre(*time_s, 1, |_| 1.0);
                0.0
            }
        };
        let a = std::mem::take(&mut self.seg);
        let time = self.t - t0;
        let (p_min, p_max) = if a.p_min <= a.p_max {
            (a.p_min, a.p_max)
        } else {
            (self.p_ch, self.p_ch)
        };
        self.panels += a.panels;
        self.p2t += a.sums[P2];
        Ok(SegmentResult {
            index: i,
            kind: s.kind(),
            label: s.label(),
            start_s: t0,
            time_s: time,
            distance_m: distance,
            x_start_m: x0,
            x_end_m: self.x,
            pressure_min_pa: p_min,
            pressure_max_pa: p_max,
            speed_min_ms: a.v_min.unwrap_or(0.0),
            speed_max_ms: a.v_max.unwrap_or(0.0),
            mean_speed_ms: if time > 0.0 { distance / time } else { 0.0 },
            energy_in_j: a.sums[EIN],
            work_out_j: a.sums[WORK],
            heat: HeatBySource {
                relief_j: a.sums[RELIEF],
                unloaded_j: a.sums[UNLOAD],
                valves_lines_j: a.sums[VALVES],
                pumps_j: a.sums[PUMPS],
            },
            stored_change_j: a.sums[STORED],
            peak_power_w: a.peak_power,
            rms_power_w: if time > 0.0 {
                (a.sums[P2] / time).max(0.0).sqrt()
            } else {
                0.0
            },
            peak_torque_nm: a.peak_torque,
            unloading_time_s: a.unloading_time,
            relief_time_s: a.relief_time,
            panels: a.panels,
        })
    }

    /// Releases the stored oil energy on the pressurised side as valve heat.
    fn release_all(&mut self, sudden: bool) {
        if let Some(dir) = self.side {
            if self.p_ch > 0.0 {
                let v = self.volume(dir, self.x);
                self.releases.push(Release {
                    segment: self.index,
                    energy_j: v * self.p_ch * self.p_ch / (2.0 * self.beta),
                    volume_m3: v * self.p_ch / self.beta,
                    sudden,
                });
            }
        }
        let e = self.stored;
        self.seg.sums[VALVES] += e;
        self.seg.sums[STORED] -= e;
        self.stored = 0.0;
        self.p_ch = 0.0;
    }

    /// Travel of `distance` in `dir` through linear force pieces
    /// (d_a, d_b, F_a, F_b), d measured from the segment start.
    fn travel(
        &mut self,
        dir: Direction,
        distance: f64,
        pieces: &[(f64, f64, f64, f64)],
    ) -> Result<(), CycleError> {
        if self.side != Some(dir) {
            self.release_all(true);
            self.side = Some(dir);
        }
        let x0 = self.x;
        let sg = sign(dir);
        for &(d_a, d_b, f_a, f_b) in pieces {
            let stall =
                |s: &Self, d: f64, f: f64, f_max: f64| CycleError::ForceNotReachable {
                    segment: s.index,
                    x_m: (x0 + sg * d).clamp(0.0, s.stroke),
                    force_n: f,
                    max_force_n: f_max,
                };
            let p_a = self
                .pressure_for(dir, f_a)
                .map_err(|fm| stall(self, d_a, f_a, fm))?;
            self.x = (x0 + sg * d_a).clamp(0.0, self.stroke);
            self.transition(dir, p_a)?;
            let len = d_b - d_a;
            if len <= 0.0 {
                continue;
            }
            let p_b = if f_b == f_a {
                p_a
            } else {
                match self.pressure_for(dir, f_b) {
                    Ok(p) => p,
                    Err(f_max) => {
                        let d = d_a + (f_max - f_a) / (f_b - f_a) * len;
                        return Err(stall(self, d, f_b, f_max));
                    }
                }
            };
            if (p_b - p_a).abs() <= 1e-12 * self.p_rf {
                self.constant_travel(dir, p_a, len);
            } else {
                let (fa, _) = self.force_at(dir, p_a);
                let (fb, _) = self.force_at(dir, p_b);
                let law = Law {
                    dir,
                    d_a,
                    d_b,
                    f_a: fa,
                    f_b: fb,
                    x0,
                };
                for (lo, hi) in self.split(dir, p_a, p_b) {
                    let piece = self.integrate_travel(&law, lo, hi)?;
                    self.accumulate(&piece);
                }
                self.p_ch = p_b;
            }
            self.x = (x0 + sg * d_b).clamp(0.0, self.stroke);
        }
        self.x = (x0 + sg * distance).clamp(0.0, self.stroke);
        Ok(())
    }

    /// Sub-intervals of a pressure run from `a` to `b` (either order), split
    /// at the staircase breakpoints, in the order travelled.
    fn split(&self, dir: Direction, a: f64, b: f64) -> Vec<(f64, f64)> {
        let (lo, hi) = (a.min(b), a.max(b));
        let mut pts = vec![lo];
        let br = match dir {
            Direction::Extend => &self.breaks_ext,
            Direction::Retract => &self.breaks_ret,
        };
        for &p in br {
            if p > lo && p < hi && p > *pts.last().unwrap_or(&lo) {
                pts.push(p);
            }
        }
        pts.push(hi);
        let mut v: Vec<(f64, f64)> = pts.windows(2).map(|w| (w[0], w[1])).collect();
        if b < a {
            v.reverse();
            for s in &mut v {
                *s = (s.1, s.0);
            }
        }
        v
    }

    /// Parameter for a sub-interval: s = p, or s = −ln(p_rf − p) in the
    /// relief band. Returns (s_a, s_b, log?).
    fn param(&self, a: f64, b: f64) -> (f64, f64, bool) {
        if a.min(b) >= self.p_rc && a.max(b) < self.p_rf {
            (-(self.p_rf - a).ln(), -(self.p_rf - b).ln(), true)
        } else {
            (a, b, false)
        }
    }

    fn p_of(&self, s: f64, log: bool) -> (f64, f64) {
        if log {
            let gap = (-s).exp();
            (self.p_rf - gap, gap)
        } else {
            (s, 1.0)
        }
    }

    /// Pressure change at the standing piston from `p_ch` to `target`: a
    /// rise is integrated, a fall releases oil energy at once.
    fn transition(&mut self, dir: Direction, target: f64) -> Result<(), CycleError> {
        if target > self.p_ch {
            for (lo, hi) in self.split(dir, self.p_ch, target) {
                let piece = self.integrate_rise(dir, lo, hi)?;
                self.accumulate(&piece);
            }
        } else if target < self.p_ch {
            let v = self.volume(dir, self.x);
            let (hi, lo) = (self.p_ch, target);
            let e = (v * (hi * hi - lo * lo) / (2.0 * self.beta)).min(self.stored);
            self.releases.push(Release {
                segment: self.index,
                energy_j: v * (hi * hi - lo * lo) / (2.0 * self.beta),
                volume_m3: v * (hi - lo) / self.beta,
                sudden: true,
            });
            self.stored -= e;
            self.seg.sums[VALVES] += e;
            self.seg.sums[STORED] -= e;
        }
        self.p_ch = target;
        Ok(())
    }

    fn integrate_rise(
        &mut self,
        dir: Direction,
        lo: f64,
        hi: f64,
    ) -> Result<Piece, CycleError> {
        let (s0, s1, log) = self.param(lo, hi);
        let x = self.x;
        self.integrate(s0, s1, |r, s| {
            let (p, dp_ds) = r.p_of(s, log);
            r.rise_node(dir, x, p, dp_ds)
        })
    }

    fn rise_node(&mut self, dir: Direction, x: f64, p: f64, dp_ds: f64) -> Node {
        let pp = self.pump(p);
        let comp = self.volume(dir, x) / self.beta * dp_ds;
        let dt = comp / pp.out_flow_m3s;
        let mut n = node_of(&pp, dt, x, None, p);
        n.r[STORED] = p * comp;
        n
    }

    fn integrate_travel(
        &mut self,
        law: &Law,
        lo: f64,
        hi: f64,
    ) -> Result<Piece, CycleError> {
        let (s0, s1, log) = self.param(lo, hi);
        let (plo, phi) = (lo.min(hi), lo.max(hi));
        let law = *law;
        self.integrate(s0, s1, |r, s| {
            let (p, dp_ds) = r.p_of(s, log);
            r.travel_node(&law, p, dp_ds, plo, phi)
        })
    }

    fn travel_node(&mut self, law: &Law, p: f64, dp_ds: f64, lo: f64, hi: f64) -> Node {
        let dir = law.dir;
        let (f, pp) = self.force_at(dir, p);
        let fp = self.force_slope(dir, p, f, lo, hi);
        let df = law.f_b - law.f_a;
        let len = law.d_b - law.d_a;
        let d = law.d_a + len * (f - law.f_a) / df;
        let dd_ds = len * fp / df * dp_ds;
        let x = law.x0 + sign(dir) * d;
        let a = driving_area(self.c, dir);
        let comp = self.volume(dir, x) / self.beta * dp_ds;
        let mov = a * dd_ds;
        let rising = df > 0.0;
        let dt = if rising { mov + comp } else { mov } / pp.out_flow_m3s;
        let v = if dt != 0.0 {
            sign(dir) * dd_ds / dt
        } else {
            0.0
        };
        let mut n = node_of(&pp, dt, x, Some(v), p);
        n.r[WORK] = f * dd_ds;
        n.r[VALVES] += (p * a - f) * dd_ds;
        n.r[STORED] = p * comp;
        if !rising {
            n.r[VALVES] -= p * comp;
        }
        n.q_ret = v.abs() * other_area(self.c, dir);
        n
    }

    /// dF/dp by differences kept inside [lo, hi] (one regime).
    fn force_slope(&self, dir: Direction, p: f64, f_p: f64, lo: f64, hi: f64) -> f64 {
        let h = (1e-6 * self.p_rf).min((hi - lo) / 4.0);
        if h <= 0.0 {
            return driving_area(self.c, dir);
        }
        let f = |q: f64| self.force_at(dir, q).0;
        if p - h >= lo && p + h <= hi {
            (f(p + h) - f(p - h)) / (2.0 * h)
        } else if p - h < lo {
            (-3.0 * f_p + 4.0 * f(p + h) - f(p + 2.0 * h)) / (2.0 * h)
        } else {
            (3.0 * f_p - 4.0 * f(p - h) + f(p - 2.0 * h)) / (2.0 * h)
        }
    }

    /// Travel at a constant pressure: dt = A·dx/Q, exact.
    fn constant_travel(&mut self, dir: Direction, p: f64, len: f64) {
        let (f, pp) = self.force_at(dir, p);
        let a = driving_area(self.c, dir);
        let dt = a / pp.out_flow_m3s;
        let v = sign(dir) / dt;
        let x_a = self.x;
        let x_b = (x_a + sign(dir) * len).clamp(0.0, self.stroke);
        let mut n = node_of(&pp, dt, x_a, Some(v), p);
        n.r[WORK] = f;
        n.r[VALVES] += p * a - f;
        n.q_ret = v.abs() * other_area(self.c, dir);
        let mut end = n;
        end.x = x_b;
        self.constant(n, end, len);
    }

    /// Adds a phase whose rates are constant over `len` (distance or time).
    fn constant(&mut self, start: Node, end: Node, len: f64) {
        self.sample(&start, self.t);
        for k in 0..NR {
            self.seg.sums[k] += start.r[k] * len;
        }
        let dt = start.r[DT] * len;
        self.stats(&start);
        self.stats(&end);
        self.regime_time(start.regime, dt);
        self.seg.panels += 1;
        self.t += dt;
        self.sample(&end, self.t);
    }

    /// Decompression over `time`: the stored oil energy is released as valve
    /// heat while the pumps circulate at the centre pressure. For the chart,
    /// √p falls linearly, as through a turbulent orifice: p = p₀·(1 − t/T)².
    fn decompress(&mut self, time: f64) {
        let p0 = self.p_ch;
        self.release_all(time <= 0.0);
        self.p_ch = p0;
        self.centre(time, DECOMPRESSION_SAMPLES, |f| (1.0 - f) * (1.0 - f));
        self.p_ch = 0.0;
    }

    /// The pumps at the centre pressure for `time`, in `steps` equal parts;
    /// the chamber holds `p_ch·shape(fraction of time)`.
    fn centre(&mut self, time: f64, steps: usize, shape: impl Fn(f64) -> f64) {
        if time <= 0.0 {
            return;
        }
        let pp = self.pump(self.p_centre);
        let mut n = node_of(&pp, 1.0, self.x, None, self.p_centre);
        n.r[VALVES] += pp.pressure_pa * pp.out_flow_m3s;
        let p0 = self.p_ch;
        for k in 0..steps {
            let mut a = n;
            a.chamber = p0 * shape(k as f64 / steps as f64);
            let mut b = n;
            b.chamber = p0 * shape((k + 1) as f64 / steps as f64);
            if k > 0 {
                // One sample per step boundary: the previous end is this start.
                self.samples.pop();
            }
            self.constant(a, b, time / steps as f64);
        }
    }

    /// Dwell with the valve shifted: the pressure rises toward relief full
    /// flow and holds; all remaining delivery crosses the relief.
    fn dwell_at_relief(&mut self, time: f64) -> Result<(), CycleError> {
        if time <= 0.0 {
            return Ok(());
        }
        let dir = *self.side.get_or_insert(Direction::Extend);
        let top = self.p_top.max(self.p_ch);
        let rise = self.rise_time(dir, self.p_ch, top)?;
        let target = if rise <= time {
            top
        } else {
            let (mut lo, mut hi) = (self.p_ch, top);
            for _ in 0..60 {
                let mid = 0.5 * (lo + hi);
                if mid <= lo || mid >= hi {
                    break;
                }
                if self.rise_time(dir, self.p_ch, mid)? < time {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            lo
        };
        let t0 = self.t;
        self.transition(dir, target)?;
        let rest = time - (self.t - t0);
        if rest > 0.0 {
            let pp = self.pump(self.p_ch);
            let mut n = node_of(&pp, 1.0, self.x, None, self.p_ch);
            // The trickle still delivered at the hold pressure crosses the relief.
            n.r[RELIEF] += pp.pressure_pa * pp.out_flow_m3s;
            self.constant(n, n, rest);
        }
        Ok(())
    }

    fn rise_time(
        &mut self,
        dir: Direction,
        from: f64,
        to: f64,
    ) -> Result<f64, CycleError> {
        let mut t = 0.0;
        if to > from {
            for (lo, hi) in self.split(dir, from, to) {
                t += self.integrate_rise(dir, lo, hi)?.sum(DT);
            }
        }
        Ok(t)
    }

    /// Composite Simpson over [s0, s1], halving the panels until the time and
    /// energy change by less than the tolerance.
    fn integrate(
        &mut self,
        s0: f64,
        s1: f64,
        mut f: impl FnMut(&mut Self, f64) -> Node,
    ) -> Result<Piece, CycleError> {
        let at = |k: usize, m: usize| s0 + (s1 - s0) * (k as f64 / m as f64);
        let nodes: Vec<Node> = (0..=4).map(|k| f(self, at(k, 4))).collect();
        let mut piece = Piece { nodes, s0, s1 };
        let mut prev = (piece.sum(DT), piece.sum(EIN));
        for _ in 0..self.opts.max_halvings {
            let m = piece.nodes.len() - 1;
            let mut next = Vec::with_capacity(2 * m + 1);
            for k in 0..m {
                next.push(piece.nodes[k]);
                next.push(f(self, at(2 * k + 1, 2 * m)));
            }
            next.push(piece.nodes[m]);
            piece.nodes = next;
            let cur = (piece.sum(DT), piece.sum(EIN));
            let tol = self.opts.tolerance;
            let close = |a: f64, b: f64| (a - b).abs() <= tol * a.abs().max(b.abs());
            if !(cur.0.is_finite() && cur.1.is_finite()) {
                break;
            }
            if close(cur.0, prev.0) && close(cur.1, prev.1) {
                return Ok(piece);
            }
            prev = cur;
        }
        Err(CycleError::NotConverged {
            segment: self.index,
        })
    }

    fn accumulate(&mut self, piece: &Piece) {
        let n = piece.panels();
        let h = (piece.s1 - piece.s0) / n as f64;
        self.sample(&piece.nodes[0], self.t);
        let mut t = self.t;
        for j in 0..n {
            let (a, b, c) = (
                &piece.nodes[2 * j],
                &piece.nodes[2 * j + 1],
                &piece.nodes[2 * j + 2],
            );
            for k in 0..NR {
                self.seg.sums[k] += h / 6.0 * (a.r[k] + 4.0 * b.r[k] + c.r[k]);
            }
            t += h / 6.0 * (a.r[DT] + 4.0 * b.r[DT] + c.r[DT]);
            let c = *c;
            self.sample(&c, t);
        }
        for nd in &piece.nodes {
            self.stats(nd);
        }
        // The clock advances by the same panel sums the samples carry.
        let dt = t - self.t;
        self.regime_time(piece.nodes[n].regime, dt);
        self.stored += piece.sum(STORED);
        self.seg.panels += n as u32;
        self.t = t;
    }

    fn regime_time(&mut self, regime: Regime, dt: f64) {
        match regime {
            Regime::Unloading => self.seg.unloading_time += dt,
            Regime::Relieving | Regime::Stalled => self.seg.relief_time += dt,
            _ => {}
        }
    }

    fn stats(&mut self, n: &Node) {
        let a = &mut self.seg;
        a.peak_power = a.peak_power.max(n.power);
        a.peak_torque = a.peak_torque.max(n.torque);
        a.p_min = a.p_min.min(n.p);
        a.p_max = a.p_max.max(n.p);
        if let Some(v) = n.v {
            let s = v.abs();
            a.v_min = Some(a.v_min.map_or(s, |m| m.min(s)));
            a.v_max = Some(a.v_max.map_or(s, |m| m.max(s)));
            self.q_sup_max = self.q_sup_max.max(n.q);
            self.q_ret_max = self.q_ret_max.max(n.q_ret);
            if self.pressing && n.p > self.p_rc && self.relief_in_pressing.is_none() {
                self.relief_in_pressing = Some((self.index, n.x, n.p));
            }
        }
        if self.side == Some(Direction::Extend) {
            self.p_ext_max = self.p_ext_max.max(n.chamber);
        }
    }

    fn sample(&mut self, n: &Node, t: f64) {
        self.samples.push(Sample {
            t_s: t,
            x_m: n.x,
            v_ms: n.v.unwrap_or(0.0),
            p_pa: n.p,
            chamber_pa: n.chamber,
            q_m3s: n.q,
            power_w: n.power,
            regime: n.regime,
            segment: self.index,
        });
    }
}

/// Node rates common to every phase: shaft energy and pump-side losses over
/// `dt` per unit parameter.
fn node_of(pp: &PumpPoint, dt: f64, x: f64, v: Option<f64>, chamber: f64) -> Node {
    let l = &pp.losses;
    let mut r = [0.0; NR];
    r[DT] = dt;
    r[EIN] = pp.shaft_power_w * dt;
    r[RELIEF] = l.relief * dt;
    r[UNLOAD] = (l.unloader + l.large_relief) * dt;
    r[VALVES] = l.check_valve * dt;
    r[PUMPS] = (l.mechanical + l.leakage) * dt;
    r[P2] = pp.shaft_power_w * pp.shaft_power_w * dt;
    Node {
        r,
        p: pp.pressure_pa,
        x,
        v,
        q: pp.out_flow_m3s,
        q_ret: 0.0,
        power: pp.shaft_power_w,
        torque: pp.torque_nm,
        regime: pp.regime,
        chamber,
    }
}

fn other_area(c: &Circuit, dir: Direction) -> f64 {
    match dir {
        Direction::Extend => c.annulus_area(),
        Direction::Retract => c.cap_area(),
    }
}

/// Linear pieces (d_a, d_b, F_a, F_b) of a pressing force over `distance`.
fn force_pieces(f: &PressingForce, distance: f64) -> Vec<(f64, f64, f64, f64)> {
    match f {
        PressingForce::Constant { force_n } => vec![(0.0, distance, *force_n, *force_n)],
        PressingForce::Linear { from_n, to_n } => vec![(0.0, distance, *from_n, *to_n)],
        PressingForce::Table { points } => {
            let mut v = Vec::new();
            let Some(first) = points.first() else {
                return vec![(0.0, distance, 0.0, 0.0)];
            };
            let mut d = 0.0;
            let mut f_prev = first.force_n;
            for pt in points {
                let pos = pt.position_m.clamp(0.0, distance);
                if pos > d || pt.force_n != f_prev {
                    v.push((d, pos, f_prev, pt.force_n));
                }
                d = pos;
                f_prev = pt.force_n;
            }
            if distance > d || v.is_empty() {
                v.push((d, distance, f_prev, f_prev));
            }
            v
        }
    }
}
