//! The validated circuit and its steady-state component models.
//!
//! [`Circuit::new`] checks a [`Design`] once and precomputes the coefficients
//! of every component; everything downstream takes a `Circuit` and cannot
//! see an invalid value. [`Circuit::pump_point`] is the power unit's state at
//! one system pressure (brief §3.2 staircase).

use std::f64::consts::PI;

use serde::Serialize;

use crate::design::Design;
use crate::error::{Checker, ErrorKind, SolveError, ValidationErrors};
use crate::faults::{FaultEffects, Stuck};
use crate::lines::{self, HoseLoss};
use crate::units::Quantity;

/// Which part of the staircase an operating point is on (brief §3.2).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Regime {
    /// I: both pumps deliver (p below the unloading setting).
    BothPumps,
    /// II: the unloading valve is opening (within its band).
    Unloading,
    /// III: the small pump alone delivers.
    SmallPump,
    /// IV: the relief valve passes part of the flow.
    Relieving,
    /// All pump flow crosses the relief valve; the cylinder stands still.
    Stalled,
}

impl Regime {
    /// A short label for people.
    pub fn label(self) -> &'static str {
        match self {
            Regime::BothPumps => "both pumps",
            Regime::Unloading => "unloader opening",
            Regime::SmallPump => "small pump only",
            Regime::Relieving => "relief passing",
            Regime::Stalled => "stalled at relief",
        }
    }
}

/// A validated hi-lo circuit with its derived coefficients (SI).
#[derive(Clone, Debug, PartialEq)]
pub struct Circuit {
    design: Design,
    /// Shaft speed (rad/s).
    pub(crate) omega: f64,
    /// Theoretical flow of L and S (m³/s).
    pub(crate) qth_l: f64,
    pub(crate) qth_s: f64,
    /// Laminar leakage coefficients (m³/s per Pa).
    pub(crate) k_l: f64,
    pub(crate) k_s: f64,
    /// Check valve: Δp = p_cv + k_cv·Q² (Pa, Pa/(m³/s)²).
    pub(crate) p_cv: f64,
    pub(crate) k_cv: f64,
    /// Check-valve back-leak conductance when closed (m³/s per Pa), a fault.
    pub(crate) cv_leak: f64,
    /// Unloaded back-pressure coefficient: p_bp = k_bp·Q² (Pa/(m³/s)²).
    pub(crate) k_bp: f64,
    /// Unloading valve start and band (Pa), after faults.
    pub(crate) p_u: f64,
    pub(crate) band: f64,
    /// Relief cracking and full-flow (Pa), after faults.
    pub(crate) p_rc: f64,
    pub(crate) p_rf: f64,
    /// Areas (m²).
    pub(crate) a_cap: f64,
    pub(crate) a_ann: f64,
    /// Quadratic coefficients of the four valve paths and two lumped lines.
    pub(crate) k_pa: f64,
    pub(crate) k_bt: f64,
    pub(crate) k_pb: f64,
    pub(crate) k_at: f64,
    pub(crate) k_pline: f64,
    pub(crate) k_rline: f64,
    pub(crate) unloader_stuck: Option<f64>,
    /// How the check valve is stuck, a fault.
    pub(crate) check_stuck: Option<Stuck>,
    /// Pressure at which the large-pump side gives when it is dead-headed
    /// (its own relief, or where leakage eats its flow, capped) (Pa).
    pub(crate) large_dead_head_pa: f64,
}

/// Cap on the dead-headed large-pump outlet when nothing limits it, as a
/// multiple of the relief's full-flow pressure (derived, modelling choice:
/// a hose or seal is taken to give there).
pub const DEAD_HEAD_CAP_FACTOR: f64 = 3.0;

/// Torque of a pump section without drag: T = V_g·Δp/(2π·η_hm) (brief §2.2),
/// written with V_g/(2π) = Q_th/ω.
fn section_torque(qth: f64, omega: f64, dp: f64, eta_hm: f64) -> f64 {
    qth * dp.max(0.0) / (omega * eta_hm)
}

/// Quadratic coefficient k of Δp = k·Q² from one rated point (brief §4,
/// turbulent orifice: Q = C_d·A·√(2Δp/ρ) ⇒ Δp ∝ Q²).
fn quad(dp_rated: f64, q_rated: f64) -> f64 {
    dp_rated / (q_rated * q_rated)
}

impl Circuit {
    /// Validates `design` and builds the circuit.
    ///
    /// # Errors
    /// Every field that is not finite, not positive where it must be,
    /// an efficiency outside (0, 1], a rod not smaller than the bore, a relief
    /// full-flow pressure below its cracking pressure or not above the
    /// unloading setting, or an unknown file format. All are reported at once.
    pub fn new(design: &Design) -> Result<Circuit, ValidationErrors> {
        validate(design)?;
        let d = design;
        let n_rps = d.drive.speed_rpm / 60.0;
        let omega = 2.0 * PI * n_rps;
        let fx = FaultEffects::of(d);
        let qth_l = d.large_pump.displacement_m3 * n_rps;
        let qth_s = d.small_pump.displacement_m3 * n_rps;
        // Brief §2.1: K = (1 − η_v,cat)·V_g·n_cat/Δp_cat, here at the drive speed.
        let eta_l = fx
            .large_volumetric_efficiency
            .unwrap_or(d.large_pump.volumetric_efficiency);
        let eta_s = fx
            .small_volumetric_efficiency
            .unwrap_or(d.small_pump.volumetric_efficiency);
        let k_l = (1.0 - eta_l) * qth_l / d.large_pump.rated_pressure_pa;
        let k_s = (1.0 - eta_s) * qth_s / d.small_pump.rated_pressure_pa;
        let cv = &d.check_valve;
        let uv = &d.unloading_valve;
        let p_u = fx.unloading_setting_pa.unwrap_or(uv.setting_pa);
        let rv = &d.relief_valve;
        let relief_scale = fx.relief_scale.unwrap_or(1.0);
        let dv = &d.directional_valve;
        let ln = &d.lines;
        let a_cap = PI * d.cylinder.bore_m.powi(2) / 4.0;
        let a_ann = PI * (d.cylinder.bore_m.powi(2) - d.cylinder.rod_m.powi(2)) / 4.0;
        let p_rf = rv.full_flow_pa * relief_scale;
        let large_dead_head_pa = d.ratings.large_pump_relief_pa.unwrap_or_else(|| {
            let cap = DEAD_HEAD_CAP_FACTOR * p_rf;
            if k_l > 0.0 {
                (qth_l / k_l).min(cap)
            } else {
                cap
            }
        });
        Ok(Circuit {
            design: design.clone(),
            omega,
            qth_l,
            qth_s,
            k_l,
            k_s,
            p_cv: cv.cracking_pa,
            k_cv: quad(cv.rated_drop_pa, cv.rated_flow_m3s),
            cv_leak: fx.check_leak_m3s_per_pa,
            k_bp: quad(uv.back_pressure_pa, uv.back_pressure_flow_m3s),
            p_u,
            band: uv.band_fraction * p_u,
            p_rc: rv.cracking_pa * relief_scale,
            p_rf,
            a_cap,
            a_ann,
            k_pa: quad(dv.drop_p_a_pa, dv.rated_flow_m3s),
            k_bt: quad(dv.drop_b_t_pa, dv.rated_flow_m3s),
            k_pb: quad(dv.drop_p_b_pa, dv.rated_flow_m3s),
            k_at: quad(dv.drop_a_t_pa, dv.rated_flow_m3s),
            k_pline: quad(ln.pressure_drop_pa, ln.rated_flow_m3s),
            k_rline: quad(ln.return_drop_pa, ln.rated_flow_m3s),
            unloader_stuck: fx.unloader_stuck_open_fraction,
            check_stuck: fx.check_stuck,
            large_dead_head_pa,
        })
    }

    /// The design this circuit was built from.
    pub fn design(&self) -> &Design {
        &self.design
    }

    /// Theoretical (geometric) flow of the large pump, V_g·n (m³/s).
    pub fn large_theoretical_flow(&self) -> f64 {
        self.qth_l
    }
    /// Theoretical (geometric) flow of the small pump, V_g·n (m³/s).
    pub fn small_theoretical_flow(&self) -> f64 {
        self.qth_s
    }
    /// Cap-end (full-bore) area πD²/4 (m²).
    pub fn cap_area(&self) -> f64 {
        self.a_cap
    }
    /// Annulus area π(D² − d²)/4 (m²).
    pub fn annulus_area(&self) -> f64 {
        self.a_ann
    }
    /// Area ratio φ = A_cap/A_ann.
    pub fn area_ratio(&self) -> f64 {
        self.a_cap / self.a_ann
    }
    /// Effective unloading setting (Pa), after injected faults.
    pub fn unloading_pa(&self) -> f64 {
        self.p_u
    }
    /// Pilot pressure at which the unloader is fully open (Pa).
    pub fn unloading_full_pa(&self) -> f64 {
        self.p_u + self.band
    }
    /// Effective relief cracking pressure (Pa).
    pub fn relief_cracking_pa(&self) -> f64 {
        self.p_rc
    }
    /// Effective relief full-flow pressure (Pa).
    pub fn relief_full_pa(&self) -> f64 {
        self.p_rf
    }
    /// How the check valve is stuck, if it is (an injected fault).
    pub fn check_stuck(&self) -> Option<Stuck> {
        self.check_stuck
    }
    /// Pressure at which the large-pump side gives when dead-headed (Pa):
    /// its own relief if the design has one, else where its leakage eats
    /// all its flow, Q_th,L/K_L, capped at [`DEAD_HEAD_CAP_FACTOR`]·p_rf.
    pub fn large_dead_head_pa(&self) -> f64 {
        self.large_dead_head_pa
    }
    /// Shaft speed (rad/s).
    pub fn omega(&self) -> f64 {
        self.omega
    }

    /// Check-valve pressure drop when open: Δp = p_cv + k_cv·Q² (brief §3.1).
    pub fn check_drop(&self, q: f64) -> f64 {
        self.p_cv + self.k_cv * q * q
    }

    /// Back-pressure of the unloaded large pump at flow `q`: k_bp·Q².
    pub fn back_pressure(&self, q: f64) -> f64 {
        self.k_bp * q * q
    }

    /// Fraction of the large pump's flow still sent to the system at pilot
    /// pressure `p`: 1 below the setting, falling linearly across the band,
    /// 0 above (brief §3.2 regime II; the linear band is a modelling choice).
    pub fn unloader_closed_fraction(&self, p: f64) -> f64 {
        if let Some(open) = self.unloader_stuck {
            return 1.0 - open;
        }
        if p <= self.p_u {
            1.0
        } else if p >= self.p_u + self.band {
            0.0
        } else {
            1.0 - (p - self.p_u) / self.band
        }
    }

    /// Fraction of the pump delivery that the relief valve passes at `p`:
    /// linear override from cracking to full flow (brief §3.2 regime IV).
    pub fn relief_fraction(&self, p: f64) -> f64 {
        if p <= self.p_rc {
            0.0
        } else if p >= self.p_rf {
            1.0
        } else {
            (p - self.p_rc) / (self.p_rf - self.p_rc)
        }
    }

    /// The state of the power unit when the system line is at `p`.
    ///
    /// # Formula
    /// ```text
    /// Q_S   = max(V_S·n − K_S·p, 0)
    /// f     = unloader closed fraction at pilot pressure p
    /// p_L   = f·(p + p_cv + k_cv·(f·Q_L)²) + (1 − f)·k_bp·((1 − f)·Q_L)²
    /// Q_L   = V_L·n − K_L·p_L                      (solved together, closed form)
    /// Q_pump = Q_S + f·Q_L,   Q_relief = r(p)·Q_pump,   Q_out = Q_pump − Q_relief
    /// T     = V_L·p_L/(2π·η_hm,L) + V_S·p/(2π·η_hm,S) + T₀,L + T₀,S
    /// ```
    /// where `r` is the relief fraction. With `f` = 1 this is regime I, with
    /// `f` = 0 regime III (brief §3.2); the split of p_L across the band is a
    /// modelling choice that keeps the power balance exact.
    ///
    /// # Stuck check valve (derived, modelling choice)
    /// *Stuck open* (brief §8.3): the large-pump outlet is the system node,
    /// p_L = p, with no cracking drop. The unloader, piloted from p, is an
    /// orifice to tank sized from the design's back-pressure point
    /// (Q_ref at p_bp,ref), scaled by its open fraction:
    /// ```text
    /// Q_esc = (1 − f)·Q_ref·√(p/p_bp,ref)     (= (1 − f)·√(p/k_bp))
    /// Q_out = max(0, Q_S + Q_L − Q_esc)·(1 − r)
    /// ```
    /// The escape is taken from the large pump's delivery first, then from
    /// the small pump's (booked as the check back-leak). Delivery stays
    /// non-increasing in p, and the system stalls near the unloading setting.
    ///
    /// *Stuck shut*: nothing from the large pump reaches the system. With
    /// the unloader shut the large pump is dead-headed at p_dh, its own
    /// relief if the design has one, else Q_th,L/K_L capped at 3·p_rf; its
    /// flow there crosses that relief (loss `large_relief`). Across the band
    /// the unloader is the same orifice: p_L = k_bp·(Q_L/(1 − f))², at most
    /// p_dh. A back-leak fault is ignored while the check is stuck.
    ///
    /// # Errors
    /// [`SolveError::PressureOutOfRange`] when `p` is not in 0 ..= p_rf.
    pub fn pump_point(&self, p: f64) -> Result<PumpPoint, SolveError> {
        if !(p.is_finite() && (0.0..=self.p_rf).contains(&p)) {
            return Err(SolveError::PressureOutOfRange { pressure_pa: p });
        }
        Ok(self.pump_point_unchecked(p))
    }

    pub(crate) fn pump_point_unchecked(&self, p: f64) -> PumpPoint {
        self.pump_point_at(p, self.unloader_closed_fraction(p))
    }

    /// The power unit at system pressure `p` with the unloader's closed
    /// fraction forced to `f` (1 = shut): for the low corner and the
    /// fast-motion pressure, which hold the unloader shut.
    pub(crate) fn pump_point_at(&self, p: f64, f: f64) -> PumpPoint {
        // Small pump: laminar slip, never negative delivery.
        let leak_s = (self.k_s * p).min(self.qth_s);
        let q_s = self.qth_s - leak_s;

        match self.check_stuck {
            Some(Stuck::Open) => return self.stuck_open_point(p, f, q_s, leak_s),
            Some(Stuck::Closed) => return self.stuck_shut_point(p, f, q_s, leak_s),
            None => {}
        }
        // p_L = A + B·Q_L², Q_L = Qth − K·p_L ⇒ K·B·Q² + Q − (Qth − K·A) = 0.
        let a = f * (p + self.p_cv);
        let b = f * f * f * self.k_cv + (1.0 - f).powi(3) * self.k_bp;
        let (q_l, p_l) = self.large_delivery(a, b);
        let leak_l = self.qth_l - q_l;
        let mut q_l_sys = f * q_l;
        let mut q_l_tank = q_l - q_l_sys;
        // A leaking check valve lets system oil back through the (open)
        // unloading valve when the system is above the large-pump outlet.
        let back_leak = if p > p_l {
            (self.cv_leak * (p - p_l)).min(q_s + q_l_sys)
        } else {
            0.0
        };
        q_l_sys -= back_leak;
        q_l_tank += back_leak;
        // A back-leak crosses from p to tank: all of p·Q_leak is lost, booked
        // under the check valve (its effect on p_bp is neglected).
        // Across the unloader band the blended p_L can fall below p; the
        // check valve then costs nothing and the unloader carries the whole
        // p_L·Q_L − p·f·Q_L (≥ 0 because p_L ≥ f·p), so no loss is negative.
        let (cv_loss, uv_loss) = if p_l >= p {
            ((p_l - p) * (f * q_l), p_l * (q_l - f * q_l))
        } else {
            (0.0, (p_l - f * p) * q_l)
        };
        self.assemble(Parts {
            p,
            f,
            p_l,
            q_s,
            leak_s,
            q_l,
            leak_l,
            q_l_sys,
            q_l_tank,
            back_leak,
            cv_loss: cv_loss + back_leak * p,
            uv_loss,
            large_relief_loss: 0.0,
        })
    }

    /// Large pump with p_L = A + B·Q_L² and Q_L = Q_th − K·p_L, solved in
    /// closed form: K·B·Q² + Q − (Q_th − K·A) = 0. Returns (Q_L, p_L).
    fn large_delivery(&self, a: f64, b: f64) -> (f64, f64) {
        let c = self.qth_l - self.k_l * a;
        let (mut q_l, mut p_l) = if c <= 0.0 {
            // Leakage would eat all delivery before the check opens.
            (
                0.0,
                if self.k_l > 0.0 {
                    self.qth_l / self.k_l
                } else {
                    a
                },
            )
        } else {
            let disc = 1.0 + 4.0 * self.k_l * b * c;
            let q = 2.0 * c / (1.0 + disc.sqrt());
            (q, a + b * q * q)
        };
        if q_l < 0.0 {
            q_l = 0.0;
        }
        if !p_l.is_finite() || p_l < 0.0 {
            p_l = 0.0;
        }
        (q_l, p_l)
    }

    /// Stuck-open check valve: p_L = p, the open unloader drains the system.
    fn stuck_open_point(&self, p: f64, f: f64, q_s: f64, leak_s: f64) -> PumpPoint {
        let leak_l = (self.k_l * p).min(self.qth_l);
        let q_l = self.qth_l - leak_l;
        let open = 1.0 - f;
        let orifice = if open <= 0.0 || p <= 0.0 {
            0.0
        } else if self.k_bp > 0.0 {
            open * (p / self.k_bp).sqrt()
        } else {
            f64::INFINITY
        };
        let escape = orifice.min(q_s + q_l);
        let from_l = escape.min(q_l);
        let from_s = escape - from_l;
        self.assemble(Parts {
            p,
            f,
            p_l: p,
            q_s,
            leak_s,
            q_l,
            leak_l,
            // Exactly −Q_S when everything escapes, so Q_pump is exactly 0.
            q_l_sys: if orifice >= q_s + q_l {
                -q_s
            } else {
                q_l - escape
            },
            q_l_tank: escape,
            back_leak: from_s,
            cv_loss: p * from_s,
            uv_loss: p * from_l,
            large_relief_loss: 0.0,
        })
    }

    /// Stuck-shut check valve: the large pump never reaches the system.
    fn stuck_shut_point(&self, p: f64, f: f64, q_s: f64, leak_s: f64) -> PumpPoint {
        let p_dh = self.large_dead_head_pa;
        let open = 1.0 - f;
        let dead = |p_l: f64| {
            let leak = (self.k_l * p_l).min(self.qth_l);
            (self.qth_l - leak, p_l)
        };
        let (q_l, p_l, q_uv) = if open <= 0.0 {
            let (q, pl) = dead(p_dh);
            (q, pl, 0.0)
        } else {
            let (q, pl) = self.large_delivery(0.0, self.k_bp / (open * open));
            if pl <= p_dh {
                (q, pl, q)
            } else {
                let (q, pl) = dead(p_dh);
                let through = if self.k_bp > 0.0 {
                    open * (p_dh / self.k_bp).sqrt()
                } else {
                    q
                };
                (q, pl, through.min(q))
            }
        };
        self.assemble(Parts {
            p,
            f,
            p_l,
            q_s,
            leak_s,
            q_l,
            leak_l: self.qth_l - q_l,
            q_l_sys: 0.0,
            q_l_tank: q_l,
            back_leak: 0.0,
            cv_loss: 0.0,
            uv_loss: p_l * q_uv,
            large_relief_loss: p_l * (q_l - q_uv),
        })
    }

    /// The operating point from its flows and the losses of the check and
    /// unloader; relief, torque and the rest of the balance are common.
    fn assemble(&self, x: Parts) -> PumpPoint {
        let Parts {
            p,
            f,
            p_l,
            q_s,
            leak_s,
            q_l,
            leak_l,
            q_l_sys,
            q_l_tank,
            back_leak,
            cv_loss,
            uv_loss,
            large_relief_loss,
        } = x;
        let d = &self.design;
        let q_pump = (q_s + q_l_sys).max(0.0);
        let r = self.relief_fraction(p);
        let q_relief = r * q_pump;
        let q_out = q_pump - q_relief;

        let lp = &d.large_pump;
        let sp = &d.small_pump;
        // V_g/(2π) = Q_th/ω, so T = Q_th·Δp/(ω·η_hm) + T₀.
        let t_l =
            section_torque(self.qth_l, self.omega, p_l, lp.hydromechanical_efficiency)
                + lp.no_load_torque_nm;
        let t_s =
            section_torque(self.qth_s, self.omega, p, sp.hydromechanical_efficiency)
                + sp.no_load_torque_nm;
        let torque = t_l + t_s;
        let shaft_power = torque * self.omega;
        // Shaft = mechanical + p_L·Q_th,L + p·Q_th,S; the hydraulic terms
        // split exactly into leakage, check, unloader, large-side relief,
        // relief and output.
        let losses = PumpLosses {
            mechanical: shaft_power - self.qth_l * p_l - self.qth_s * p,
            leakage: leak_l * p_l + leak_s * p,
            check_valve: cv_loss,
            unloader: uv_loss,
            large_relief: large_relief_loss,
            relief: p * q_relief,
        };
        let regime = if p >= self.p_rf {
            Regime::Stalled
        } else if p > self.p_rc {
            Regime::Relieving
        } else if f <= 0.0 {
            Regime::SmallPump
        } else if f < 1.0 {
            Regime::Unloading
        } else {
            Regime::BothPumps
        };
        PumpPoint {
            pressure_pa: p,
            regime,
            large_outlet_pa: p_l,
            small_flow_m3s: q_s,
            large_flow_m3s: q_l,
            large_to_system_m3s: q_l_sys,
            large_to_tank_m3s: q_l_tank,
            check_back_leak_m3s: back_leak,
            relief_flow_m3s: q_relief,
            out_flow_m3s: q_out,
            small_leakage_m3s: leak_s,
            large_leakage_m3s: leak_l,
            unloader_open_fraction: 1.0 - f,
            torque_nm: torque,
            shaft_power_w: shaft_power,
            hydraulic_out_w: p * q_out,
            losses,
        }
    }

    /// Pressure drop of one directional-valve path at flow q.
    pub fn valve_drop(&self, path: ValvePath, q: f64) -> f64 {
        let k = match path {
            ValvePath::PA => self.k_pa,
            ValvePath::BT => self.k_bt,
            ValvePath::PB => self.k_pb,
            ValvePath::AT => self.k_at,
        };
        k * q * q
    }

    /// Pressure-line drop at flow q: lumped plus optional hose.
    pub fn pressure_line_drop(&self, q: f64) -> f64 {
        self.k_pline * q * q + self.hose(true, q).map_or(0.0, |h| h.drop_pa)
    }

    /// Return-line drop at flow q: lumped plus optional hose.
    pub fn return_line_drop(&self, q: f64) -> f64 {
        self.k_rline * q * q + self.hose(false, q).map_or(0.0, |h| h.drop_pa)
    }

    /// Darcy–Weisbach loss of the pressure (`true`) or return hose at `q`.
    pub fn hose(&self, pressure_side: bool, q: f64) -> Option<HoseLoss> {
        let ln = &self.design.lines;
        let h = if pressure_side {
            ln.pressure_hose.as_ref()
        } else {
            ln.return_hose.as_ref()
        }?;
        Some(lines::hose_loss(h.bore_m, h.length_m, q, &self.design.oil))
    }
}

/// A directional-valve flow path (ISO 9461 port letters).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum ValvePath {
    /// Pump to cap end.
    PA,
    /// Rod end to tank.
    BT,
    /// Pump to rod end.
    PB,
    /// Cap end to tank.
    AT,
}

/// Where the shaft power goes at one pump-side operating point (W).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Default)]
pub struct PumpLosses {
    /// Friction in both pump sections (η_hm and no-load torque).
    pub mechanical: f64,
    /// Internal leakage (slip) of both pumps.
    pub leakage: f64,
    /// Pressure drop across the open check valve, and any back-leak.
    pub check_valve: f64,
    /// Large pump's flow dumped through the unloading valve.
    pub unloader: f64,
    /// Large pump's flow over its own relief (or through whatever gives)
    /// when dead-headed behind a stuck-shut check valve.
    pub large_relief: f64,
    /// Flow over the relief valve.
    pub relief: f64,
}

/// Flows and check/unloader losses of one operating point, before the
/// common relief, torque and power terms.
struct Parts {
    p: f64,
    f: f64,
    p_l: f64,
    q_s: f64,
    leak_s: f64,
    q_l: f64,
    leak_l: f64,
    q_l_sys: f64,
    q_l_tank: f64,
    back_leak: f64,
    cv_loss: f64,
    uv_loss: f64,
    large_relief_loss: f64,
}

impl PumpLosses {
    /// Sum of all losses (W).
    pub fn total(&self) -> f64 {
        self.mechanical
            + self.leakage
            + self.check_valve
            + self.unloader
            + self.large_relief
            + self.relief
    }
}

/// The power unit's state at one system pressure (SI).
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct PumpPoint {
    /// System pressure, downstream of the check valve (Pa).
    pub pressure_pa: f64,
    /// Staircase regime.
    pub regime: Regime,
    /// Large-pump outlet pressure, upstream of the check valve (Pa).
    pub large_outlet_pa: f64,
    /// Small pump delivery (m³/s).
    pub small_flow_m3s: f64,
    /// Large pump delivery (m³/s).
    pub large_flow_m3s: f64,
    /// Part of the large pump's delivery through the check valve (m³/s).
    pub large_to_system_m3s: f64,
    /// Part dumped through the unloading valve (m³/s).
    pub large_to_tank_m3s: f64,
    /// System oil leaking back through a faulty check valve (m³/s).
    pub check_back_leak_m3s: f64,
    /// Flow over the relief valve (m³/s).
    pub relief_flow_m3s: f64,
    /// Flow from the power unit to the directional valve (m³/s).
    pub out_flow_m3s: f64,
    /// Internal leakage of the small pump (m³/s).
    pub small_leakage_m3s: f64,
    /// Internal leakage of the large pump (m³/s).
    pub large_leakage_m3s: f64,
    /// How far the unloading valve is open, 0 closed to 1 fully open.
    pub unloader_open_fraction: f64,
    /// Shaft torque of both sections (N·m).
    pub torque_nm: f64,
    /// Shaft power (W).
    pub shaft_power_w: f64,
    /// Hydraulic power leaving the power unit, p·Q_out (W).
    pub hydraulic_out_w: f64,
    /// Losses (W).
    pub losses: PumpLosses,
}

fn validate(d: &Design) -> Result<(), ValidationErrors> {
    use crate::design::DESIGN_FORMAT;
    use Quantity::*;
    let mut c = Checker::default();
    if d.format != DESIGN_FORMAT {
        c.push(
            "format",
            f64::from(d.format),
            ErrorKind::UnsupportedFormat {
                found: d.format,
                supported: DESIGN_FORMAT,
            },
        );
    }
    c.range(
        "drive.speed_rpm",
        ShaftSpeed,
        d.drive.speed_rpm,
        1.0,
        10_000.0,
    );
    if let Some(m) = d.drive.motor_rating_w {
        c.positive("drive.motor_rating_w", Power, m);
    }
    c.efficiency("drive.motor_efficiency", d.drive.motor_efficiency);
    for (p, pre) in [(&d.large_pump, 0), (&d.small_pump, 1)] {
        const F: [[&str; 5]; 2] = [
            [
                "large_pump.displacement_m3",
                "large_pump.volumetric_efficiency",
                "large_pump.rated_pressure_pa",
                "large_pump.hydromechanical_efficiency",
                "large_pump.no_load_torque_nm",
            ],
            [
                "small_pump.displacement_m3",
                "small_pump.volumetric_efficiency",
                "small_pump.rated_pressure_pa",
                "small_pump.hydromechanical_efficiency",
                "small_pump.no_load_torque_nm",
            ],
        ];
        let f = F[pre];
        c.positive(f[0], Displacement, p.displacement_m3);
        c.efficiency(f[1], p.volumetric_efficiency);
        c.positive(f[2], Pressure, p.rated_pressure_pa);
        c.efficiency(f[3], p.hydromechanical_efficiency);
        c.non_negative(f[4], Torque, p.no_load_torque_nm);
    }
    let cv = &d.check_valve;
    c.non_negative("check_valve.cracking_pa", Pressure, cv.cracking_pa);
    c.non_negative("check_valve.rated_drop_pa", Pressure, cv.rated_drop_pa);
    c.positive("check_valve.rated_flow_m3s", Flow, cv.rated_flow_m3s);
    let uv = &d.unloading_valve;
    let u_ok = c.positive("unloading_valve.setting_pa", Pressure, uv.setting_pa);
    c.range(
        "unloading_valve.band_fraction",
        Percent,
        uv.band_fraction,
        0.001,
        0.5,
    );
    c.range(
        "unloading_valve.reseat_fraction",
        Percent,
        uv.reseat_fraction,
        0.0,
        0.5,
    );
    c.non_negative(
        "unloading_valve.back_pressure_pa",
        Pressure,
        uv.back_pressure_pa,
    );
    c.positive(
        "unloading_valve.back_pressure_flow_m3s",
        Flow,
        uv.back_pressure_flow_m3s,
    );
    let rv = &d.relief_valve;
    let rc_ok = c.positive("relief_valve.cracking_pa", Pressure, rv.cracking_pa);
    let rf_ok = c.positive("relief_valve.full_flow_pa", Pressure, rv.full_flow_pa);
    if rc_ok && rf_ok && rv.full_flow_pa <= rv.cracking_pa {
        c.push(
            "relief_valve.full_flow_pa",
            rv.full_flow_pa,
            ErrorKind::FullFlowBelowCracking {
                cracking_pa: rv.cracking_pa,
            },
        );
    }
    if u_ok && rf_ok && rv.full_flow_pa <= uv.setting_pa {
        c.push(
            "relief_valve.full_flow_pa",
            rv.full_flow_pa,
            ErrorKind::ReliefNotAboveUnloading {
                unloading_pa: uv.setting_pa,
            },
        );
    }
    let dv = &d.directional_valve;
    c.positive("directional_valve.rated_flow_m3s", Flow, dv.rated_flow_m3s);
    c.non_negative("directional_valve.drop_p_a_pa", Pressure, dv.drop_p_a_pa);
    c.non_negative("directional_valve.drop_b_t_pa", Pressure, dv.drop_b_t_pa);
    c.non_negative("directional_valve.drop_p_b_pa", Pressure, dv.drop_p_b_pa);
    c.non_negative("directional_valve.drop_a_t_pa", Pressure, dv.drop_a_t_pa);
    let ln = &d.lines;
    c.non_negative("lines.pressure_drop_pa", Pressure, ln.pressure_drop_pa);
    c.non_negative("lines.return_drop_pa", Pressure, ln.return_drop_pa);
    c.positive("lines.rated_flow_m3s", Flow, ln.rated_flow_m3s);
    if let Some(h) = &ln.pressure_hose {
        c.positive("lines.pressure_hose.bore_m", Length, h.bore_m);
        c.non_negative("lines.pressure_hose.length_m", Length, h.length_m);
    }
    if let Some(h) = &ln.return_hose {
        c.positive("lines.return_hose.bore_m", Length, h.bore_m);
        c.non_negative("lines.return_hose.length_m", Length, h.length_m);
    }
    c.positive("oil.density_kg_m3", Density, d.oil.density_kg_m3);
    c.positive("oil.viscosity_m2s", Viscosity, d.oil.viscosity_m2s);
    c.positive("oil.bulk_modulus_pa", BulkModulus, d.oil.bulk_modulus_pa);
    let cy = &d.cylinder;
    let bore_ok = c.positive("cylinder.bore_m", Length, cy.bore_m);
    let rod_ok = c.positive("cylinder.rod_m", Length, cy.rod_m);
    if bore_ok && rod_ok && cy.rod_m >= cy.bore_m {
        c.push(
            "cylinder.rod_m",
            cy.rod_m,
            ErrorKind::RodNotSmallerThanBore { bore_m: cy.bore_m },
        );
    }
    c.positive("cylinder.stroke_m", Length, cy.stroke_m);
    c.non_negative("loads.approach_force_n", Force, d.loads.approach_force_n);
    c.non_negative("loads.pressing_force_n", Force, d.loads.pressing_force_n);
    c.non_negative("loads.retract_force_n", Force, d.loads.retract_force_n);
    c.positive("ratings.component_pa", Pressure, d.ratings.component_pa);
    if let Some(p) = d.ratings.large_pump_relief_pa {
        c.positive("ratings.large_pump_relief_pa", Pressure, p);
    }
    let r = &d.rules;
    c.range(
        "rules.unload_margin_factor",
        Ratio,
        r.unload_margin_factor,
        1.0,
        3.0,
    );
    c.non_negative(
        "rules.unload_margin_min_pa",
        Pressure,
        r.unload_margin_min_pa,
    );
    c.range(
        "rules.relief_margin_factor",
        Ratio,
        r.relief_margin_factor,
        1.0,
        3.0,
    );
    c.non_negative(
        "rules.relief_margin_min_pa",
        Pressure,
        r.relief_margin_min_pa,
    );
    crate::cycle::validate(d, &mut c);
    crate::faults::validate(&d.faults, &mut c);
    c.finish()
}
