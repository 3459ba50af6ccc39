//! The numeric inputs of a design, by path: label, group, quantity, slider
//! range and default (brief §11), and get/set by path.
//!
//! The app builds its sliders from [`FIELDS`] and the URL codec walks the
//! same list, so the bounds cannot drift apart. Ranges are slider bounds,
//! not validity limits: a typed value outside them is accepted when it is
//! physically valid ([`crate::Circuit::new`] decides).

use crate::design::Design;
use crate::units::{Quantity, BAR};

/// Input groups, in the order a practitioner thinks in.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Group {
    /// Pumps and drive.
    Pumps,
    /// Valves.
    Valves,
    /// Cylinder and load.
    Cylinder,
}

impl Group {
    /// Label for people.
    pub fn label(self) -> &'static str {
        match self {
            Group::Pumps => "Pumps and drive",
            Group::Valves => "Valves",
            Group::Cylinder => "Cylinder and load",
        }
    }
}

/// One numeric input.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct FieldSpec {
    /// Dotted path in the design file.
    pub path: &'static str,
    /// Label for people.
    pub label: &'static str,
    /// Group.
    pub group: Group,
    /// Quantity (decides the unit).
    pub quantity: Quantity,
    /// Slider minimum (SI).
    pub min: f64,
    /// Slider maximum (SI).
    pub max: f64,
    /// Typical default (SI), brief §11.
    pub default: f64,
    /// Folded away under "more inputs".
    pub advanced: bool,
}

const CM3: f64 = 1e-6;
const MM: f64 = 1e-3;

#[allow(clippy::too_many_arguments)] // one row of the table, positional on purpose
const fn f(
    path: &'static str,
    label: &'static str,
    group: Group,
    quantity: Quantity,
    min: f64,
    max: f64,
    default: f64,
    advanced: bool,
) -> FieldSpec {
    FieldSpec {
        path,
        label,
        group,
        quantity,
        min,
        max,
        default,
        advanced,
    }
}

use Group::*;
use Quantity as Q;

/// Every numeric input, in display order. Ranges and defaults: brief §11
/// (common practice, no source, unless the brief says otherwise).
pub const FIELDS: &[FieldSpec] = &[
    f(
        "large_pump.displacement_m3",
        "Large pump displacement",
        Pumps,
        Q::Displacement,
        5.0 * CM3,
        250.0 * CM3,
        63.0 * CM3,
        false,
    ),
    f(
        "small_pump.displacement_m3",
        "Small pump displacement",
        Pumps,
        Q::Displacement,
        1.0 * CM3,
        63.0 * CM3,
        8.0 * CM3,
        false,
    ),
    f(
        "drive.speed_rpm",
        "Shaft speed",
        Pumps,
        Q::ShaftSpeed,
        600.0,
        3000.0,
        1450.0,
        false,
    ),
    f(
        "large_pump.volumetric_efficiency",
        "Large pump volumetric efficiency",
        Pumps,
        Q::Percent,
        0.75,
        0.99,
        0.92,
        true,
    ),
    f(
        "small_pump.volumetric_efficiency",
        "Small pump volumetric efficiency",
        Pumps,
        Q::Percent,
        0.75,
        0.99,
        0.92,
        true,
    ),
    f(
        "large_pump.hydromechanical_efficiency",
        "Large pump hydro-mechanical efficiency",
        Pumps,
        Q::Percent,
        0.75,
        0.97,
        0.90,
        true,
    ),
    f(
        "small_pump.hydromechanical_efficiency",
        "Small pump hydro-mechanical efficiency",
        Pumps,
        Q::Percent,
        0.75,
        0.97,
        0.90,
        true,
    ),
    f(
        "large_pump.rated_pressure_pa",
        "Large pump efficiency rated at",
        Pumps,
        Q::Pressure,
        10.0 * BAR,
        350.0 * BAR,
        50.0 * BAR,
        true,
    ),
    f(
        "small_pump.rated_pressure_pa",
        "Small pump efficiency rated at",
        Pumps,
        Q::Pressure,
        10.0 * BAR,
        350.0 * BAR,
        200.0 * BAR,
        true,
    ),
    f(
        "drive.motor_efficiency",
        "Motor efficiency",
        Pumps,
        Q::Percent,
        0.75,
        0.97,
        0.90,
        true,
    ),
    f(
        "unloading_valve.setting_pa",
        "Unloading setting",
        Valves,
        Q::Pressure,
        5.0 * BAR,
        120.0 * BAR,
        30.0 * BAR,
        false,
    ),
    f(
        "relief_valve.cracking_pa",
        "Relief cracking pressure",
        Valves,
        Q::Pressure,
        20.0 * BAR,
        350.0 * BAR,
        160.0 * BAR,
        false,
    ),
    f(
        "relief_valve.full_flow_pa",
        "Relief full-flow pressure",
        Valves,
        Q::Pressure,
        20.0 * BAR,
        400.0 * BAR,
        168.0 * BAR,
        false,
    ),
    f(
        "unloading_valve.band_fraction",
        "Unloader opening band",
        Valves,
        Q::Percent,
        0.01,
        0.15,
        0.05,
        true,
    ),
    f(
        "unloading_valve.reseat_fraction",
        "Unloader reseat hysteresis",
        Valves,
        Q::Percent,
        0.0,
        0.30,
        0.03,
        true,
    ),
    f(
        "unloading_valve.back_pressure_pa",
        "Unloaded back-pressure",
        Valves,
        Q::Pressure,
        0.5 * BAR,
        15.0 * BAR,
        4.0 * BAR,
        true,
    ),
    f(
        "check_valve.cracking_pa",
        "Check valve cracking pressure",
        Valves,
        Q::Pressure,
        0.05 * BAR,
        5.0 * BAR,
        0.5 * BAR,
        true,
    ),
    f(
        "directional_valve.drop_p_a_pa",
        "Directional valve drop P→A",
        Valves,
        Q::Pressure,
        1.0 * BAR,
        15.0 * BAR,
        5.0 * BAR,
        true,
    ),
    f(
        "directional_valve.drop_b_t_pa",
        "Directional valve drop B→T",
        Valves,
        Q::Pressure,
        1.0 * BAR,
        15.0 * BAR,
        5.0 * BAR,
        true,
    ),
    f(
        "directional_valve.drop_p_b_pa",
        "Directional valve drop P→B",
        Valves,
        Q::Pressure,
        1.0 * BAR,
        15.0 * BAR,
        5.0 * BAR,
        true,
    ),
    f(
        "directional_valve.drop_a_t_pa",
        "Directional valve drop A→T",
        Valves,
        Q::Pressure,
        1.0 * BAR,
        15.0 * BAR,
        5.0 * BAR,
        true,
    ),
    f(
        "directional_valve.rated_flow_m3s",
        "Directional valve rated flow",
        Valves,
        Q::Flow,
        10.0 / 60_000.0,
        650.0 / 60_000.0,
        60.0 / 60_000.0,
        true,
    ),
    f(
        "cylinder.bore_m",
        "Cylinder bore",
        Cylinder,
        Q::Length,
        25.0 * MM,
        400.0 * MM,
        100.0 * MM,
        false,
    ),
    f(
        "cylinder.rod_m",
        "Rod diameter",
        Cylinder,
        Q::Length,
        10.0 * MM,
        320.0 * MM,
        56.0 * MM,
        false,
    ),
    f(
        "cylinder.stroke_m",
        "Stroke",
        Cylinder,
        Q::Length,
        25.0 * MM,
        2500.0 * MM,
        400.0 * MM,
        true,
    ),
    f(
        "loads.approach_force_n",
        "Approach force",
        Cylinder,
        Q::Force,
        0.0,
        50.0e3,
        1.5e3,
        false,
    ),
    f(
        "loads.pressing_force_n",
        "Pressing force",
        Cylinder,
        Q::Force,
        0.0,
        2000.0e3,
        100.0e3,
        false,
    ),
    f(
        "loads.retract_force_n",
        "Retract force",
        Cylinder,
        Q::Force,
        0.0,
        50.0e3,
        1.0e3,
        false,
    ),
    f(
        "ratings.component_pa",
        "Lowest component rating",
        Cylinder,
        Q::Pressure,
        50.0 * BAR,
        700.0 * BAR,
        250.0 * BAR,
        true,
    ),
];

/// The spec of `path`, if it is a numeric input.
pub fn spec(path: &str) -> Option<&'static FieldSpec> {
    FIELDS.iter().find(|s| s.path == path)
}

macro_rules! paths {
    ($d:ident, $path:ident, $body:ident) => {
        match $path {
            "large_pump.displacement_m3" => $body!($d.large_pump.displacement_m3),
            "small_pump.displacement_m3" => $body!($d.small_pump.displacement_m3),
            "drive.speed_rpm" => $body!($d.drive.speed_rpm),
            "drive.motor_efficiency" => $body!($d.drive.motor_efficiency),
            "large_pump.volumetric_efficiency" => {
                $body!($d.large_pump.volumetric_efficiency)
            }
            "small_pump.volumetric_efficiency" => {
                $body!($d.small_pump.volumetric_efficiency)
            }
            "large_pump.hydromechanical_efficiency" => {
                $body!($d.large_pump.hydromechanical_efficiency)
            }
            "small_pump.hydromechanical_efficiency" => {
                $body!($d.small_pump.hydromechanical_efficiency)
            }
            "large_pump.rated_pressure_pa" => $body!($d.large_pump.rated_pressure_pa),
            "small_pump.rated_pressure_pa" => $body!($d.small_pump.rated_pressure_pa),
            "unloading_valve.setting_pa" => $body!($d.unloading_valve.setting_pa),
            "unloading_valve.band_fraction" => $body!($d.unloading_valve.band_fraction),
            "unloading_valve.reseat_fraction" => {
                $body!($d.unloading_valve.reseat_fraction)
            }
            "unloading_valve.back_pressure_pa" => {
                $body!($d.unloading_valve.back_pressure_pa)
            }
            "relief_valve.cracking_pa" => $body!($d.relief_valve.cracking_pa),
            "relief_valve.full_flow_pa" => $body!($d.relief_valve.full_flow_pa),
            "check_valve.cracking_pa" => $body!($d.check_valve.cracking_pa),
            "directional_valve.drop_p_a_pa" => $body!($d.directional_valve.drop_p_a_pa),
            "directional_valve.drop_b_t_pa" => $body!($d.directional_valve.drop_b_t_pa),
            "directional_valve.drop_p_b_pa" => $body!($d.directional_valve.drop_p_b_pa),
            "directional_valve.drop_a_t_pa" => $body!($d.directional_valve.drop_a_t_pa),
            "directional_valve.rated_flow_m3s" => {
                $body!($d.directional_valve.rated_flow_m3s)
            }
            "cylinder.bore_m" => $body!($d.cylinder.bore_m),
            "cylinder.rod_m" => $body!($d.cylinder.rod_m),
            "cylinder.stroke_m" => $body!($d.cylinder.stroke_m),
            "loads.approach_force_n" => $body!($d.loads.approach_force_n),
            "loads.pressing_force_n" => $body!($d.loads.pressing_force_n),
            "loads.retract_force_n" => $body!($d.loads.retract_force_n),
            "ratings.component_pa" => $body!($d.ratings.component_pa),
            _ => None,
        }
    };
}

/// Reads the numeric input at `path`.
pub fn get(d: &Design, path: &str) -> Option<f64> {
    macro_rules! read {
        ($e:expr) => {
            Some($e)
        };
    }
    paths!(d, path, read)
}

/// Writes the numeric input at `path`; returns false for an unknown path.
pub fn set(d: &mut Design, path: &str, v: f64) -> bool {
    macro_rules! write {
        ($e:expr) => {{
            $e = v;
            Some(())
        }};
    }
    paths!(d, path, write).is_some()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_field_reads_and_writes() {
        let mut d = Design::default();
        for s in FIELDS {
            assert!(s.min <= s.default && s.default <= s.max, "{}", s.path);
            assert!(get(&d, s.path).is_some(), "{}", s.path);
            assert!(set(&mut d, s.path, s.default), "{}", s.path);
            assert_eq!(get(&d, s.path), Some(s.default), "{}", s.path);
        }
        assert!(get(&d, "nope").is_none());
        assert!(!set(&mut d, "nope", 1.0));
    }
}
