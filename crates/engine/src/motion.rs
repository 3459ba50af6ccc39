//! Operating point for a load force: cylinder, valve paths and lines.
//!
//! # Formula (brief §4, §5.2)
//! ```text
//! extend:  p_B = Δp_BT(Q/φ) + Δp_ret(Q/φ)
//!          p_A = (F + p_B·A_ann)/A_cap
//!          p_req(Q) = p_A + Δp_PA(Q) + Δp_line(Q)
//! retract: p_A = Δp_AT(φ·Q) + Δp_ret(φ·Q)
//!          p_B = (F + p_A·A_cap)/A_ann
//!          p_req(Q) = p_B + Δp_PB(Q) + Δp_line(Q)
//! g(p) = p − p_req(Q_out(p)) = 0
//! ```
//! Q_out(p) does not rise with p and p_req(Q) does not fall with Q, so g is
//! increasing and its root in 0 ..= p_rf is unique: a bracketed search
//! always finds it (brief §5.2 bisection; here sped up, see
//! `increasing_root`). If g(p_rf) < 0 the force is not reachable.

use serde::Serialize;

use crate::circuit::{Circuit, PumpPoint, ValvePath};
use crate::error::SolveError;

/// Direction of the cylinder.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Direction {
    /// Rod out: pump to cap end (A), rod end (B) to tank.
    Extend,
    /// Rod in: pump to rod end (B), cap end (A) to tank.
    Retract,
}

/// Which motion of the machine.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Motion {
    /// Rapid approach (extend, approach force).
    Approach,
    /// Pressing (extend, pressing force).
    Pressing,
    /// Rapid retract (retract force).
    Retract,
}

impl Motion {
    /// All three, in cycle order.
    pub const ALL: [Motion; 3] = [Motion::Approach, Motion::Pressing, Motion::Retract];
    /// Direction of travel.
    pub fn direction(self) -> Direction {
        match self {
            Motion::Retract => Direction::Retract,
            _ => Direction::Extend,
        }
    }
    /// Label for people.
    pub fn label(self) -> &'static str {
        match self {
            Motion::Approach => "approach",
            Motion::Pressing => "pressing",
            Motion::Retract => "retract",
        }
    }
}

/// One steady motion of the cylinder against a force (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct MotionPoint {
    /// Direction of travel.
    pub direction: Direction,
    /// Load force (N).
    pub force_n: f64,
    /// Power-unit state at the solved system pressure.
    pub pump: PumpPoint,
    /// Flow into the cylinder (m³/s).
    pub cylinder_flow_m3s: f64,
    /// Flow out of the other end of the cylinder (m³/s).
    pub return_flow_m3s: f64,
    /// Piston speed (m/s).
    pub speed_ms: f64,
    /// Cap-end pressure (Pa).
    pub cap_pa: f64,
    /// Rod-end pressure (Pa).
    pub rod_pa: f64,
    /// Drop in the supply path of the directional valve (Pa).
    pub supply_valve_drop_pa: f64,
    /// Drop in the return path of the directional valve (Pa).
    pub return_valve_drop_pa: f64,
    /// Pressure-line drop (Pa).
    pub supply_line_drop_pa: f64,
    /// Return-line drop (Pa).
    pub return_line_drop_pa: f64,
    /// Mechanical power into the load, F·v (W).
    pub load_power_w: f64,
    /// Power lost in valve paths and lines (W).
    pub circuit_loss_w: f64,
    /// Residual g(p) of the solved pressure (Pa).
    pub residual_pa: f64,
}

struct Required {
    p: f64,
    cap: f64,
    rod: f64,
    q_ret: f64,
    dv_sup: f64,
    dv_ret: f64,
    ln_sup: f64,
    ln_ret: f64,
}

fn required(c: &Circuit, dir: Direction, force: f64, q: f64) -> Required {
    let phi = c.area_ratio();
    match dir {
        Direction::Extend => {
            let q_ret = q / phi;
            let dv_ret = c.valve_drop(ValvePath::BT, q_ret);
            let ln_ret = c.return_line_drop(q_ret);
            let rod = dv_ret + ln_ret;
            let cap = (force + rod * c.annulus_area()) / c.cap_area();
            let dv_sup = c.valve_drop(ValvePath::PA, q);
            let ln_sup = c.pressure_line_drop(q);
            Required {
                p: cap + dv_sup + ln_sup,
                cap,
                rod,
                q_ret,
                dv_sup,
                dv_ret,
                ln_sup,
                ln_ret,
            }
        }
        Direction::Retract => {
            let q_ret = q * phi;
            let dv_ret = c.valve_drop(ValvePath::AT, q_ret);
            let ln_ret = c.return_line_drop(q_ret);
            let cap = dv_ret + ln_ret;
            let rod = (force + cap * c.cap_area()) / c.annulus_area();
            let dv_sup = c.valve_drop(ValvePath::PB, q);
            let ln_sup = c.pressure_line_drop(q);
            Required {
                p: rod + dv_sup + ln_sup,
                cap,
                rod,
                q_ret,
                dv_sup,
                dv_ret,
                ln_sup,
                ln_ret,
            }
        }
    }
}

/// System pressure that moves `force` in `dir` with `q` reaching the
/// cylinder: p_req(F, Q) of the module docs. It is linear in F with slope
/// 1/A_in (A_in the pressurised area), which the duty cycle uses to invert it.
pub(crate) fn required_pressure(c: &Circuit, dir: Direction, force: f64, q: f64) -> f64 {
    required(c, dir, force, q).p
}

/// Pressurised (driving) area in `dir`: A_cap extending, A_ann retracting.
pub(crate) fn driving_area(c: &Circuit, dir: Direction) -> f64 {
    match dir {
        Direction::Extend => c.cap_area(),
        Direction::Retract => c.annulus_area(),
    }
}

/// Root of a non-decreasing `g` on [lo, hi], given g(lo) < 0 ≤ g(hi) as
/// `(x, g(x))` pairs: bracketed false position with the Illinois rule
/// (halve the weight of an end kept twice running), and a bisection step
/// whenever the bracket has failed to halve twice running, so it never
/// needs more steps than about three bisections would. Stops at
/// |g(x)| ≤ tol(x) or when the bracket is down to adjacent floats, and then
/// returns the end with the smaller |g|. Numerical-analysis textbook method
/// (Dowell and Jarratt's Illinois variant of regula falsi, from memory).
pub(crate) fn increasing_root(
    (mut lo, mut g_lo): (f64, f64),
    (mut hi, mut g_hi): (f64, f64),
    g: impl Fn(f64) -> f64,
    tol: impl Fn(f64) -> f64,
) -> f64 {
    let (mut w_lo, mut w_hi) = (g_lo, g_hi);
    let mut kept: i8 = 0;
    let mut slow: u8 = 0;
    for _ in 0..300 {
        let width = hi - lo;
        let mid = lo + 0.5 * width;
        let mut x = if slow >= 2 {
            mid
        } else {
            hi - w_hi * (width / (w_hi - w_lo))
        };
        if !(x > lo && x < hi) {
            x = mid;
        }
        if !(x > lo && x < hi) {
            break;
        }
        let gx = g(x);
        if gx < 0.0 {
            (lo, g_lo, w_lo) = (x, gx, gx);
            if kept < 0 {
                w_hi *= 0.5;
            }
            kept = -1;
        } else {
            (hi, g_hi, w_hi) = (x, gx, gx);
            if kept > 0 {
                w_lo *= 0.5;
            }
            kept = 1;
        }
        slow = if hi - lo > 0.5 * width { slow + 1 } else { 0 };
        if gx.abs() <= tol(x) {
            return x;
        }
    }
    if g_lo.abs() <= g_hi.abs() {
        lo
    } else {
        hi
    }
}

/// Largest force the cylinder can hold in `dir` at relief full flow, zero speed.
pub fn max_force(c: &Circuit, dir: Direction) -> f64 {
    match dir {
        Direction::Extend => c.relief_full_pa() * c.cap_area(),
        Direction::Retract => c.relief_full_pa() * c.annulus_area(),
    }
}

/// Solves the steady operating point for `force` in `dir`.
///
/// `pump` maps a system pressure to the power-unit state; pass
/// `|p| c.pump_point_unchecked(p)` for the real circuit, or a variant (e.g.
/// both pumps forced on) for what-if figures.
pub(crate) fn solve_with(
    c: &Circuit,
    dir: Direction,
    force: f64,
    pump: impl Fn(f64) -> PumpPoint,
) -> Result<MotionPoint, SolveError> {
    let g = |p: f64| -> (f64, PumpPoint) {
        let pp = pump(p);
        (p - required(c, dir, force, pp.out_flow_m3s).p, pp)
    };
    let p_max = c.relief_full_pa();
    let (g_hi, _) = g(p_max);
    if g_hi < 0.0 {
        return Err(SolveError::ForceNotReachable {
            force_n: force,
            max_force_n: max_force(c, dir),
        });
    }
    let (g_lo, _) = g(0.0);
    let p = if g_lo >= 0.0 {
        0.0
    } else {
        // g rises with slope ≥ 1 (module docs), so |g| bounds the pressure
        // error: stop at a residual of 1e-13 of the pressure.
        increasing_root((0.0, g_lo), (p_max, g_hi), |p| g(p).0, |p| 1e-13 * p)
    };
    let (res, pp) = g(p);
    let q = pp.out_flow_m3s;
    let r = required(c, dir, force, q);
    let area = match dir {
        Direction::Extend => c.cap_area(),
        Direction::Retract => c.annulus_area(),
    };
    let v = q / area;
    let circuit_loss = (r.dv_sup + r.ln_sup) * q + (r.dv_ret + r.ln_ret) * r.q_ret;
    Ok(MotionPoint {
        direction: dir,
        force_n: force,
        pump: pp,
        cylinder_flow_m3s: q,
        return_flow_m3s: r.q_ret,
        speed_ms: v,
        cap_pa: r.cap,
        rod_pa: r.rod,
        supply_valve_drop_pa: r.dv_sup,
        return_valve_drop_pa: r.dv_ret,
        supply_line_drop_pa: r.ln_sup,
        return_line_drop_pa: r.ln_ret,
        load_power_w: force * v,
        circuit_loss_w: circuit_loss,
        residual_pa: res,
    })
}

impl Circuit {
    /// Steady operating point of the cylinder moving in `dir` against `force` (N).
    ///
    /// # Errors
    /// [`SolveError::ForceNotReachable`] when even relief full-flow pressure
    /// cannot hold the force.
    pub fn motion_point(
        &self,
        dir: Direction,
        force: f64,
    ) -> Result<MotionPoint, SolveError> {
        solve_with(self, dir, force, |p| self.pump_point_unchecked(p))
    }

    /// Operating point of one of the design's three motions.
    ///
    /// # Errors
    /// As [`Circuit::motion_point`].
    pub fn motion(&self, m: Motion) -> Result<MotionPoint, SolveError> {
        let l = &self.design().loads;
        let f = match m {
            Motion::Approach => l.approach_force_n,
            Motion::Pressing => l.pressing_force_n,
            Motion::Retract => l.retract_force_n,
        };
        self.motion_point(m.direction(), f)
    }

    /// Pressure a motion needs when both pumps deliver in full (unloader
    /// held shut): the "fast-motion pressure" of brief §3.3 step 1.
    ///
    /// # Errors
    /// As [`Circuit::motion_point`].
    pub fn fast_motion_pressure(
        &self,
        dir: Direction,
        force: f64,
    ) -> Result<f64, SolveError> {
        solve_with(self, dir, force, |p| self.pump_point_at(p, 1.0))
            .map(|m| m.pump.pressure_pa)
    }
}
