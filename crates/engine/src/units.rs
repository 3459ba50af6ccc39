//! Units at the boundary: SI inside the engine, trade units outside.
//!
//! Every quantity inside the engine is coherent SI (Pa, m³/s, m³/rev, m, N,
//! W, N·m, m/s, m², m³). This module converts to and from the two unit
//! systems a practitioner types in: metric trade units (bar, L/min,
//! cm³/rev, mm, kN, kW, N·m) and US customary (psi, gpm, in³/rev, in, lbf,
//! hp, lbf·in).
//!
//! # Sources
//! Conversion factors are from NIST Special Publication 811 (2008),
//! Appendix B, or follow exactly from the definitions it gives:
//! 1 in = 0.0254 m (exact), 1 lbf = 4.448 221 615 260 5 N (exact),
//! 1 US gal = 231 in³ (exact), 1 hp = 550 ft·lbf/s.

use serde::{Deserialize, Serialize};

/// One inch in metres (exact by definition, NIST SP 811 B.8).
pub const INCH: f64 = 0.0254;
/// One pound-force in newtons (exact by definition, NIST SP 811 B.8).
pub const POUND_FORCE: f64 = 4.448_221_615_260_5;
/// One psi (lbf/in²) in pascals, derived from [`POUND_FORCE`] and [`INCH`];
/// NIST SP 811 B.8 lists 6.894 757 E+03.
pub const PSI: f64 = POUND_FORCE / (INCH * INCH);
/// One bar in pascals (exact, NIST SP 811 B.8).
pub const BAR: f64 = 1.0e5;
/// One US liquid gallon in cubic metres: 231 in³ exactly
/// (NIST SP 811 B.8 lists 3.785 412 E-03).
pub const US_GALLON: f64 = 231.0 * INCH * INCH * INCH;
/// One litre in cubic metres (exact).
pub const LITRE: f64 = 1.0e-3;
/// One horsepower (550 ft·lbf/s) in watts (NIST SP 811 B.8: 7.456 999 E+02).
pub const HORSEPOWER: f64 = 550.0 * 12.0 * INCH * POUND_FORCE;
/// One minute in seconds.
pub const MINUTE: f64 = 60.0;
/// One pound-force inch in newton metres.
pub const POUND_FORCE_INCH: f64 = POUND_FORCE * INCH;
/// One BTU (International Table) in joules (NIST SP 811 B.8: 1.055 056 E+03).
pub const BTU_IT: f64 = 1_055.055_852_62;

/// Which set of trade units the user reads and types.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
#[serde(rename_all = "lowercase")]
pub enum UnitSystem {
    /// bar, L/min, cm³/rev, mm, kN, kW, N·m.
    #[default]
    Metric,
    /// psi, gpm, in³/rev, in, lbf, hp, lbf·in.
    Us,
}

impl UnitSystem {
    /// Parses `metric` or `us` (any case).
    pub fn parse(s: &str) -> Option<UnitSystem> {
        match s.to_ascii_lowercase().as_str() {
            "metric" | "si" => Some(UnitSystem::Metric),
            "us" | "imperial" => Some(UnitSystem::Us),
            _ => None,
        }
    }
}

/// The kind of a physical quantity, which decides its display unit.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Quantity {
    /// Gauge pressure (SI: Pa).
    Pressure,
    /// Volume flow (SI: m³/s).
    Flow,
    /// Pump displacement per revolution (SI: m³/rev).
    Displacement,
    /// Length: bores, strokes, distances (SI: m).
    Length,
    /// Force (SI: N).
    Force,
    /// Power (SI: W).
    Power,
    /// Torque (SI: N·m).
    Torque,
    /// Linear speed of the cylinder (SI: m/s).
    Velocity,
    /// Area (SI: m²).
    Area,
    /// Volume of oil (SI: m³).
    Volume,
    /// Energy (SI: J).
    Energy,
    /// Shaft speed (SI: rpm, the trade unit in both systems).
    ShaftSpeed,
    /// Time (s in both systems).
    Time,
    /// A plain ratio or efficiency (shown in %).
    Percent,
    /// A ratio shown as is (area ratio, pump ratio).
    Ratio,
    /// Temperature (SI here: °C; US: °F).
    Temperature,
    /// Temperature difference (K or °F).
    TemperatureRise,
    /// Heat-transfer coefficient (W/(m²·K); US BTU/(h·ft²·°F)).
    HeatTransfer,
    /// Bulk modulus (shown like a pressure but in GPa or kpsi).
    BulkModulus,
    /// Kinematic viscosity (cSt in both systems; SI m²/s).
    Viscosity,
    /// Density (kg/m³ in both).
    Density,
    /// Electric current (A in both).
    Current,
    /// Electric voltage (V in both).
    Voltage,
}

/// Display unit: the symbol and how many SI units one display unit holds,
/// plus an offset (only temperatures have one).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct DisplayUnit {
    /// Symbol shown next to numbers, e.g. `bar`.
    pub symbol: &'static str,
    /// SI value of one display unit.
    pub scale: f64,
    /// SI value of the display zero (for °F against °C).
    pub offset: f64,
    /// Decimal places that suit this unit in results.
    pub decimals: usize,
}

const fn u(symbol: &'static str, scale: f64, decimals: usize) -> DisplayUnit {
    DisplayUnit {
        symbol,
        scale,
        offset: 0.0,
        decimals,
    }
}

/// The display unit of `q` in `system`.
pub fn unit(q: Quantity, system: UnitSystem) -> DisplayUnit {
    use Quantity::*;
    use UnitSystem::*;
    match (q, system) {
        (Pressure, Metric) => u("bar", BAR, 1),
        (Pressure, Us) => u("psi", PSI, 0),
        (Flow, Metric) => u("L/min", LITRE / MINUTE, 1),
        (Flow, Us) => u("gpm", US_GALLON / MINUTE, 2),
        (Displacement, Metric) => u("cm³/rev", 1.0e-6, 1),
        (Displacement, Us) => u("in³/rev", INCH * INCH * INCH, 3),
        (Length, Metric) => u("mm", 1.0e-3, 0),
        (Length, Us) => u("in", INCH, 2),
        (Force, Metric) => u("kN", 1.0e3, 1),
        (Force, Us) => u("lbf", POUND_FORCE, 0),
        (Power, Metric) => u("kW", 1.0e3, 2),
        (Power, Us) => u("hp", HORSEPOWER, 2),
        (Torque, Metric) => u("N·m", 1.0, 1),
        (Torque, Us) => u("lbf·in", POUND_FORCE_INCH, 0),
        (Velocity, Metric) => u("mm/s", 1.0e-3, 1),
        (Velocity, Us) => u("in/s", INCH, 2),
        (Area, Metric) => u("cm²", 1.0e-4, 2),
        (Area, Us) => u("in²", INCH * INCH, 3),
        (Volume, Metric) => u("L", LITRE, 2),
        (Volume, Us) => u("gal", US_GALLON, 2),
        (Energy, Metric) => u("kJ", 1.0e3, 2),
        (Energy, Us) => u("BTU", BTU_IT, 1),
        (ShaftSpeed, _) => u("rpm", 1.0, 0),
        (Time, _) => u("s", 1.0, 2),
        (Percent, _) => u("%", 0.01, 1),
        (Ratio, _) => u("", 1.0, 2),
        (Temperature, Metric) => u("°C", 1.0, 1),
        (Temperature, Us) => DisplayUnit {
            symbol: "°F",
            scale: 5.0 / 9.0,
            offset: -32.0 * 5.0 / 9.0,
            decimals: 0,
        },
        (TemperatureRise, Metric) => u("K", 1.0, 1),
        (TemperatureRise, Us) => u("°F", 5.0 / 9.0, 1),
        (HeatTransfer, Metric) => u("W/(m²·K)", 1.0, 1),
        // 1 BTU/(h·ft²·°F) = BTU / 3600 s / (0.3048 m)² / (5/9 K).
        (HeatTransfer, Us) => u(
            "BTU/(h·ft²·°F)",
            BTU_IT / 3600.0 / (12.0 * INCH * 12.0 * INCH) / (5.0 / 9.0),
            2,
        ),
        (BulkModulus, Metric) => u("GPa", 1.0e9, 2),
        (BulkModulus, Us) => u("kpsi", 1.0e3 * PSI, 0),
        (Viscosity, _) => u("cSt", 1.0e-6, 0),
        (Density, _) => u("kg/m³", 1.0, 0),
        (Current, _) => u("A", 1.0, 1),
        (Voltage, _) => u("V", 1.0, 0),
    }
}

/// Converts an SI value to the display unit of `q` in `system`.
pub fn to_display(q: Quantity, system: UnitSystem, si: f64) -> f64 {
    let d = unit(q, system);
    (si - d.offset) / d.scale
}

/// Converts a value typed in the display unit of `q` in `system` to SI.
pub fn from_display(q: Quantity, system: UnitSystem, shown: f64) -> f64 {
    let d = unit(q, system);
    shown * d.scale + d.offset
}

/// Formats an SI value with its unit, e.g. `"68.9 bar"`.
pub fn format(q: Quantity, system: UnitSystem, si: f64) -> String {
    let d = unit(q, system);
    let v = to_display(q, system, si);
    if !v.is_finite() {
        return format!("— {}", d.symbol);
    }
    let dec = adaptive_decimals(v, d.decimals);
    if d.symbol.is_empty() {
        format!("{v:.dec$}")
    } else if d.symbol == "%" {
        format!("{v:.dec$} %")
    } else {
        format!("{v:.dec$} {}", d.symbol)
    }
}

/// More decimals for small magnitudes so that 0.0123 kW does not print as
/// 0.01 kW; never fewer than `base`.
pub fn adaptive_decimals(v: f64, base: usize) -> usize {
    let a = v.abs();
    if a == 0.0 || a >= 10.0 {
        base
    } else if a >= 1.0 {
        base.max(1)
    } else if a >= 0.1 {
        base.max(2)
    } else {
        base.max(3)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trip_every_quantity() {
        let all = [
            Quantity::Pressure,
            Quantity::Flow,
            Quantity::Displacement,
            Quantity::Length,
            Quantity::Force,
            Quantity::Power,
            Quantity::Torque,
            Quantity::Velocity,
            Quantity::Area,
            Quantity::Volume,
            Quantity::Energy,
            Quantity::Temperature,
            Quantity::TemperatureRise,
            Quantity::HeatTransfer,
            Quantity::BulkModulus,
        ];
        for q in all {
            for s in [UnitSystem::Metric, UnitSystem::Us] {
                let si = 1234.5678;
                let back = from_display(q, s, to_display(q, s, si));
                assert!((back - si).abs() <= 1e-12 * si, "{q:?} {s:?}: {back}");
            }
        }
    }

    #[test]
    fn fahrenheit_offset() {
        // 100 °C = 212 °F, 0 °C = 32 °F (definition of the scales).
        assert!(
            (to_display(Quantity::Temperature, UnitSystem::Us, 100.0) - 212.0).abs()
                < 1e-9
        );
        assert!(
            (to_display(Quantity::Temperature, UnitSystem::Us, 0.0) - 32.0).abs() < 1e-9
        );
    }

    #[test]
    fn format_carries_unit() {
        assert_eq!(
            format(Quantity::Pressure, UnitSystem::Metric, 68.948e5),
            "68.9 bar"
        );
        assert_eq!(
            format(Quantity::Pressure, UnitSystem::Us, 1000.0 * PSI),
            "1000 psi"
        );
        assert_eq!(UnitSystem::parse("US"), Some(UnitSystem::Us));
        assert_eq!(UnitSystem::parse("furlongs"), None);
    }
}
