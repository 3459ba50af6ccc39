//! Pipe and hose losses by Darcy–Weisbach (brief §4, line losses).
//!
//! # Formula
//! ```text
//! v  = Q / (π d²/4)            Re = v·d/ν
//! Δp = f·(L/d)·ρ·v²/2
//! f  = 64/Re                           Re < 2300        (laminar, Hagen–Poiseuille)
//! f  = 0.316·Re^(−1/4)                 Re > 4000        (Blasius, smooth turbulent)
//! f  = linear in Re from 64/2300 to 0.316·4000^(−1/4)   in between (flagged)
//! ```
//! Sources: Darcy–Weisbach, Hagen–Poiseuille and Blasius as in any fluid
//! mechanics text (from memory). The blend across the transition band is our
//! choice: it keeps Δp(Q) continuous, which the operating-point solver needs.
//! Blasius is valid to about Re = 10⁵.

use serde::Serialize;

use crate::design::Oil;

/// Reynolds number below which flow is taken as laminar.
pub const RE_LAMINAR: f64 = 2300.0;
/// Reynolds number above which flow is taken as turbulent.
pub const RE_TURBULENT: f64 = 4000.0;

/// Flow regime in a line.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum FlowRegime {
    /// Re < 2300.
    Laminar,
    /// 2300 ≤ Re ≤ 4000: friction factor uncertain.
    Transition,
    /// Re > 4000.
    Turbulent,
}

/// Loss in one hose at one flow.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct HoseLoss {
    /// Mean velocity (m/s).
    pub velocity_ms: f64,
    /// Reynolds number.
    pub reynolds: f64,
    /// Darcy friction factor used.
    pub friction_factor: f64,
    /// Pressure drop (Pa).
    pub drop_pa: f64,
    /// Flow regime.
    pub regime: FlowRegime,
}

/// Laminar Darcy friction factor 64/Re.
pub fn laminar_friction(re: f64) -> f64 {
    64.0 / re
}

/// Blasius smooth-pipe friction factor 0.316·Re^(−1/4).
pub fn blasius_friction(re: f64) -> f64 {
    0.316 * re.powf(-0.25)
}

/// Friction factor with the transition blend described in the module docs.
pub fn friction_factor(re: f64) -> (f64, FlowRegime) {
    if re < RE_LAMINAR {
        (laminar_friction(re), FlowRegime::Laminar)
    } else if re <= RE_TURBULENT {
        let lo = laminar_friction(RE_LAMINAR);
        let hi = blasius_friction(RE_TURBULENT);
        let t = (re - RE_LAMINAR) / (RE_TURBULENT - RE_LAMINAR);
        (lo + t * (hi - lo), FlowRegime::Transition)
    } else {
        (blasius_friction(re), FlowRegime::Turbulent)
    }
}

/// Darcy–Weisbach loss of a hose of bore `d` (m) and length `l` (m) at flow
/// `q` (m³/s). Zero flow gives zero loss.
pub fn hose_loss(d: f64, l: f64, q: f64, oil: &Oil) -> HoseLoss {
    let q = q.abs();
    let area = std::f64::consts::PI * d * d / 4.0;
    let v = q / area;
    let re = v * d / oil.viscosity_m2s;
    if re <= 0.0 || !re.is_finite() {
        return HoseLoss {
            velocity_ms: 0.0,
            reynolds: 0.0,
            friction_factor: 0.0,
            drop_pa: 0.0,
            regime: FlowRegime::Laminar,
        };
    }
    let (f, regime) = friction_factor(re);
    HoseLoss {
        velocity_ms: v,
        reynolds: re,
        friction_factor: f,
        drop_pa: f * (l / d) * oil.density_kg_m3 * v * v / 2.0,
        regime,
    }
}

/// Hagen–Poiseuille laminar drop 128·μ·L·Q/(π·d⁴) (Pa), for cross-checks.
pub fn hagen_poiseuille(d: f64, l: f64, q: f64, oil: &Oil) -> f64 {
    let mu = oil.viscosity_m2s * oil.density_kg_m3;
    128.0 * mu * l * q / (std::f64::consts::PI * d.powi(4))
}
