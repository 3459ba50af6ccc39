//! Faults injected into a design, for teaching and for diagnosis tests.
//!
//! A fault changes what the circuit does, not what the design says: the
//! nameplate values stay in the design and the settings check still judges
//! the intended settings. Every fault is off by default.

use serde::{Deserialize, Serialize};

use crate::design::Design;
use crate::error::Checker;
use crate::units::Quantity;

/// Highest relief scale a fault may carry (a relief set 50 % high).
pub const RELIEF_SCALE_MAX: f64 = 1.5;

/// How a stuck valve (the unloading valve or the check valve) sits.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Stuck {
    /// Always open. Unloader: the large pump never reaches the system.
    /// Check valve: the large-pump outlet is the system node.
    Open,
    /// Always shut. Unloader: the large pump never unloads. Check valve:
    /// nothing from the large pump reaches the system.
    Closed,
}

/// Injected faults (all optional).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(deny_unknown_fields)]
pub struct Faults {
    /// Worn large pump: its actual volumetric efficiency at its rated pressure.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub large_volumetric_efficiency: Option<f64>,
    /// Worn small pump: its actual volumetric efficiency at its rated pressure.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub small_volumetric_efficiency: Option<f64>,
    /// Leaking check valve: back-leak conductance when closed (m³/s per Pa).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub check_leak_m3s_per_pa: Option<f64>,
    /// Unloading valve actually set to this pressure (Pa): set low or high.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unloading_setting_pa: Option<f64>,
    /// Unloading valve stuck open or shut.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub unloader_stuck: Option<Stuck>,
    /// Check valve stuck open or shut (derived, modelling choice: see
    /// [`crate::circuit::Circuit::pump_point`]).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub check_stuck: Option<Stuck>,
    /// Relief valve actually set to this multiple of its design settings
    /// (below 1: set low or leaking; above 1: set high), 0.05 to 1.5.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub relief_scale: Option<f64>,
}

impl Faults {
    /// True when no fault is injected.
    pub fn is_empty(&self) -> bool {
        *self == Faults::default()
    }
}

/// The faults resolved into model coefficients.
pub(crate) struct FaultEffects {
    pub(crate) large_volumetric_efficiency: Option<f64>,
    pub(crate) small_volumetric_efficiency: Option<f64>,
    pub(crate) check_leak_m3s_per_pa: f64,
    pub(crate) unloading_setting_pa: Option<f64>,
    /// Open fraction forced on the unloader, when stuck.
    pub(crate) unloader_stuck_open_fraction: Option<f64>,
    pub(crate) relief_scale: Option<f64>,
    /// How the check valve is stuck, if it is.
    pub(crate) check_stuck: Option<Stuck>,
}

impl FaultEffects {
    pub(crate) fn of(d: &Design) -> FaultEffects {
        let f = &d.faults;
        FaultEffects {
            large_volumetric_efficiency: f.large_volumetric_efficiency,
            small_volumetric_efficiency: f.small_volumetric_efficiency,
            check_leak_m3s_per_pa: f.check_leak_m3s_per_pa.unwrap_or(0.0),
            unloading_setting_pa: f.unloading_setting_pa,
            unloader_stuck_open_fraction: f.unloader_stuck.map(|s| match s {
                Stuck::Open => 1.0,
                Stuck::Closed => 0.0,
            }),
            relief_scale: f.relief_scale,
            check_stuck: f.check_stuck,
        }
    }
}

pub(crate) fn validate(f: &Faults, c: &mut Checker) {
    if let Some(v) = f.large_volumetric_efficiency {
        c.efficiency("faults.large_volumetric_efficiency", v);
    }
    if let Some(v) = f.small_volumetric_efficiency {
        c.efficiency("faults.small_volumetric_efficiency", v);
    }
    if let Some(v) = f.check_leak_m3s_per_pa {
        c.non_negative("faults.check_leak_m3s_per_pa", Quantity::Ratio, v);
    }
    if let Some(v) = f.unloading_setting_pa {
        c.positive("faults.unloading_setting_pa", Quantity::Pressure, v);
    }
    if let Some(v) = f.relief_scale {
        c.range(
            "faults.relief_scale",
            Quantity::Ratio,
            v,
            0.05,
            RELIEF_SCALE_MAX,
        );
    }
}
